import type { QueryInterface } from 'sequelize';

/**
 * Level spacing joined the parameter table (drive.levelSpacing, drive.dutyTable): stored presets
 * and their revisions get "linear" — even steps of light, which is what every stored set was
 * rendered with — and the starting duty table, so every stored parameter set stays complete.
 * The values are those of ADDED_SINCE_VERSION_1 (shared/model/parameters.ts), which gives older
 * preset files the same on import.
 */
export async function up(qi: QueryInterface): Promise<void> {
  for (const table of ['presets', 'preset_revisions']) {
    await qi.sequelize.query(`
      UPDATE ${table} SET parameters = jsonb_set(parameters, '{drive,levelSpacing}', '"linear"')
      WHERE NOT (parameters->'drive' ? 'levelSpacing')
    `);
    await qi.sequelize.query(`
      UPDATE ${table} SET parameters = jsonb_set(parameters, '{drive,dutyTable}', '[0, 0.09, 0.4, 1]')
      WHERE NOT (parameters->'drive' ? 'dutyTable')
    `);
  }
}

export async function down(qi: QueryInterface): Promise<void> {
  for (const table of ['presets', 'preset_revisions']) {
    await qi.sequelize.query(`UPDATE ${table} SET parameters = parameters #- '{drive,levelSpacing}' #- '{drive,dutyTable}'`);
  }
}
