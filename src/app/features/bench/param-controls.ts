import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import {
  GROUP_LABELS,
  GROUPS,
  PARAMS,
  panelParamsPatchSchema,
  type Group,
  type ListSpec,
  type NumberSpec,
  type PanelParams,
  type ParamSpec,
} from '@shared/model/parameters';
import { haloRadiusFromGlass } from '@shared/pipeline/glow/glow';

/** A control another setting decides: shown read-only with the value in force and why. */
export interface ParamLock {
  /** The value that applies (shown instead of the stored one), when it differs. */
  value?: number;
  /** Why it cannot be changed here ("Set by the drive timing “EL 75 Hz”"). */
  reason: string;
}

/**
 * One edit, applied by the owner of the parameters to its own current set. An edit never carries
 * a whole parameter set: a copy taken from this component's input could be a change behind (the
 * input updates on the next change detection), and writing it back would undo the edit before it.
 */
export type ParamEdit =
  { kind: 'set'; group: Group; key: string; value: unknown } | { kind: 'reset'; group: Group; to: PanelParams[Group] };

/** Applies an edit to a parameter set, returning a new set. */
export function applyParamEdit(params: PanelParams, edit: ParamEdit): PanelParams {
  const next = structuredClone(params);
  if (edit.kind === 'reset') Object.assign(next, { [edit.group]: structuredClone(edit.to) });
  else Object.assign(next[edit.group], { [edit.key]: edit.value });
  return next;
}

/** The parameter table as controls, along the path of the light; each group can be reset. */
@Component({
  selector: 'em-param-controls',
  imports: [MatExpansionModule, MatSliderModule, MatSelectModule, MatSlideToggleModule, MatButtonModule, MatIconModule, MatTooltipModule],
  templateUrl: './param-controls.html',
  styleUrl: './param-controls.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ParamControls {
  readonly params = input.required<PanelParams>();
  readonly defaults = input.required<PanelParams>();
  readonly disabled = input(false);
  /** Controls decided elsewhere, by "group.key", on top of the ones this component derives itself. */
  readonly locks = input<Readonly<Record<string, ParamLock>>>({});
  readonly changed = output<ParamEdit>();

  /** Every lock in force: the given ones, and a halo radius that the glass decides. */
  protected readonly allLocks = computed<Record<string, ParamLock>>(() => {
    const { glass, drive } = this.params();
    const own: Record<string, ParamLock> = {};
    if (glass.haloFromGlass) {
      own['glass.haloRadiusMm'] = {
        value: Math.round(haloRadiusFromGlass(glass.glassThicknessMm, glass.refractiveIndex) * 1000) / 1000,
        reason: 'From the glass: 2 × thickness × tan(asin(1 ÷ refractive index)). Turn off “Halo from glass” to set it.',
      };
    }
    if (drive.levelSpacing === 'table') {
      own['drive.grayLevels'] = {
        value: drive.dutyTable.length,
        reason: 'Set by the duty table: one level for each value. Choose another level spacing to set it here.',
      };
    }
    return { ...own, ...this.locks() };
  });

  /** What is wrong with a list as typed, by control id (the text stays in the field to be fixed). */
  protected readonly listProblems = signal<Readonly<Record<string, string>>>({});

  protected lockOf(spec: ParamSpec): ParamLock | undefined {
    return this.allLocks()[`${spec.group}.${spec.key}`];
  }

  protected readonly groups = GROUPS.map((g) => ({ key: g, label: GROUP_LABELS[g], specs: PARAMS.filter((p) => p.group === g) }));

  protected valueOf(spec: ParamSpec): unknown {
    return (this.params()[spec.group] as Record<string, unknown>)[spec.key];
  }

  protected num(spec: ParamSpec): number {
    return this.lockOf(spec)?.value ?? (this.valueOf(spec) as number);
  }

  protected asNumber(spec: ParamSpec): NumberSpec {
    return spec as NumberSpec;
  }

  protected setValue(spec: ParamSpec, value: unknown): void {
    if (spec.kind === 'number' || spec.kind === 'int') {
      let n = Number(value);
      if (!Number.isFinite(n)) return;
      n = Math.min(spec.max, Math.max(spec.min, spec.kind === 'int' ? Math.round(n) : n));
      value = n;
    }
    this.changed.emit({ kind: 'set', group: spec.group, key: spec.key, value });
  }

  protected listText(spec: ParamSpec): string {
    return (this.valueOf(spec) as number[]).join(', ');
  }

  protected listUnit(spec: ParamSpec): string {
    return (spec as ListSpec).unit;
  }

  protected listHint(spec: ParamSpec): string {
    const list = spec as ListSpec;
    const inUse = spec.key !== 'dutyTable' || this.params().drive.levelSpacing === 'table';
    const shape = `${list.minLength}–${list.maxLength} values from ${list.min} to ${list.max}, rising, separated by commas or spaces.`;
    return inUse ? shape : `Used when the level spacing is “Duty table”. ${shape}`;
  }

  /** Parses a typed list ("0, 0.09, 0.4, 1"); a bad one is kept in the field with what to fix, and nothing changes. */
  protected setList(spec: ParamSpec, text: string): void {
    const id = `${spec.group}-${spec.key}`;
    const parts = text.split(/[\s,;]+/).filter(Boolean);
    const values = parts.map(Number);
    const bad = parts.find((p, k) => !Number.isFinite(values[k]));
    const checked = bad === undefined ? panelParamsPatchSchema.safeParse({ [spec.group]: { [spec.key]: values } }) : null;
    const problem =
      bad !== undefined
        ? `“${bad}” is not a number. Type values like 0, 0.09, 0.4, 1.`
        : checked && !checked.success
          ? checked.error.issues[0].message
          : '';
    this.listProblems.update((all) => ({ ...all, [id]: problem }));
    if (!problem) this.changed.emit({ kind: 'set', group: spec.group, key: spec.key, value: values });
  }

  protected resetGroup(group: Group): void {
    this.listProblems.set({});
    this.changed.emit({ kind: 'reset', group, to: this.defaults()[group] });
  }

  protected isDefault(group: Group): boolean {
    return JSON.stringify(this.params()[group]) === JSON.stringify(this.defaults()[group]);
  }
}
