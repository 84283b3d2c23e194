import { builtInPresetById, panelTypeById } from '@shared/model/panel-types';
import { AppError } from '../../core/app-error';
import type { LookSpec } from '../exports/export.model';
import { Preset } from './preset.model';

/** A look a request names: a studio preset ("studio:<id>") at its current revision, or a built-in preset. 400 naming what to give instead. */
export async function resolveLook(studioId: string, ref: string, field = 'looks'): Promise<LookSpec> {
  if (ref.startsWith('studio:')) {
    const id = ref.slice('studio:'.length);
    const preset = /^[0-9a-f-]{36}$/i.test(id) ? await Preset.findOne({ where: { id, studioId } }) : null;
    if (!preset)
      throw new AppError(
        400,
        'invalid_input',
        "A chosen preset is not in this studio (deleted, or another studio's). Choose again from the list.",
        { issues: [{ path: field, message: `no preset ${id} in this studio` }] },
      );
    return {
      id: ref,
      name: preset.name,
      revision: preset.revision,
      panelTypeId: preset.panelTypeId,
      panelTypeName: panelTypeById(preset.panelTypeId)?.name ?? preset.panelTypeId,
      parameters: preset.parameters,
    };
  }
  const builtIn = builtInPresetById(ref);
  if (!builtIn)
    throw new AppError(
      400,
      'invalid_input',
      `There is no look “${ref.slice(0, 100)}”: give a studio preset as studio:<id> or a built-in preset id (GET /api/panel-types lists them).`,
      { issues: [{ path: field, message: 'unknown look' }] },
    );
  return {
    id: ref,
    name: builtIn.name,
    revision: null,
    panelTypeId: builtIn.panelTypeId,
    panelTypeName: panelTypeById(builtIn.panelTypeId)!.name,
    parameters: builtIn.parameters,
  };
}
