import type { QueryInterface } from 'sequelize';

/**
 * The CRT scan-line sampling parameter (cell.lineSampling) joined the parameter table: stored
 * presets and their revisions get its default, "auto" (lines centred on pixel rows below 4 px a
 * line, area-true from 4 px on), so every stored parameter set stays complete.
 */
export async function up(qi: QueryInterface): Promise<void> {
  for (const table of ['presets', 'preset_revisions']) {
    await qi.sequelize.query(`
      UPDATE ${table} SET parameters = jsonb_set(parameters, '{cell,lineSampling}', '"auto"')
      WHERE NOT (parameters->'cell' ? 'lineSampling')
    `);
  }
}

export async function down(qi: QueryInterface): Promise<void> {
  for (const table of ['presets', 'preset_revisions']) {
    await qi.sequelize.query(`UPDATE ${table} SET parameters = parameters #- '{cell,lineSampling}'`);
  }
}
