import type { PresetDto } from '@shared/api/dto';
import { BUILT_IN_PRESETS, panelTypeById } from '@shared/model/panel-types';
import type { PanelParams } from '@shared/model/parameters';

/** A look to choose: a studio preset at its current revision ("studio:<id>"), or a built-in preset. */
export interface LookOption {
  id: string;
  name: string;
  panelTypeName: string;
  parameters: PanelParams;
  studio: boolean;
}

/** The studio's presets, then the built-in ones, as the look pickers list them. */
export function lookOptionsOf(presets: readonly PresetDto[]): LookOption[] {
  return [
    ...presets.map((p) => ({
      id: `studio:${p.id}`,
      name: `${p.name} · r${p.revision}`,
      panelTypeName: panelTypeById(p.panelTypeId)?.name ?? p.panelTypeId,
      parameters: p.parameters,
      studio: true,
    })),
    ...BUILT_IN_PRESETS.map((p) => ({
      id: p.id,
      name: p.name,
      panelTypeName: panelTypeById(p.panelTypeId)!.name,
      parameters: p.parameters,
      studio: false,
    })),
  ];
}
