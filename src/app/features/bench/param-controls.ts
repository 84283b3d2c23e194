import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatSliderModule } from '@angular/material/slider';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTooltipModule } from '@angular/material/tooltip';
import { GROUPS, PARAMS, type Group, type NumberSpec, type PanelParams, type ParamSpec } from '../../../../shared/model/parameters';

const GROUP_LABELS: Record<Group, string> = { source: 'Source', drive: 'Drive', cell: 'Cell', emission: 'Emission', glass: 'Glass', viewing: 'Viewing' };

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
  readonly changed = output<PanelParams>();

  protected readonly groups = GROUPS.map((g) => ({ key: g, label: GROUP_LABELS[g], specs: PARAMS.filter((p) => p.group === g) }));

  protected valueOf(spec: ParamSpec): unknown {
    return (this.params()[spec.group] as Record<string, unknown>)[spec.key];
  }

  protected num(spec: ParamSpec): number {
    return this.valueOf(spec) as number;
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
    const next = structuredClone(this.params());
    (next[spec.group] as Record<string, unknown>)[spec.key] = value;
    this.changed.emit(next);
  }

  protected resetGroup(group: Group): void {
    const next = structuredClone(this.params());
    (next as unknown as Record<string, unknown>)[group] = structuredClone(this.defaults()[group]);
    this.changed.emit(next);
  }

  protected isDefault(group: Group): boolean {
    return JSON.stringify(this.params()[group]) === JSON.stringify(this.defaults()[group]);
  }
}
