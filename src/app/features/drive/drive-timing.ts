import { DecimalPipe, KeyValuePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, resource, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { SavedTimingDto } from '@shared/api/dto';
import type { CreateTimingBody, TimingSource } from '@shared/api/timing.schema';
import { BIOS_MODES, FIXED_TIMINGS, fixedTiming, modeName, parseMode } from '@shared/drive/dmt';
import { evaluateTiming } from '@shared/drive/evaluate';
import { PIXELS_PER_CLOCK, type PanelInterface } from '@shared/drive/interface';
import { VbeFieldRangeError, vbeCrtcInfoBlock, vgaRegisters, hex2 } from '@shared/drive/registers';
import type { Standard } from '@shared/drive/resolve';
import { DEFAULT_PANEL_TYPE_ID, PANEL_TYPES } from '@shared/model/panel-types';
import { apiErrorMessage } from '../../core/api-error';
import { Confirm } from '../../shared/confirm-dialog';
import { StudioContext } from '../studio/studio-context';
import { FrameDataCard } from './frame-data-card';
import { RegisterTable } from './register-table';
import { SafetyNotice } from './safety-notice';
import { TimingApi } from './timing-api';
import { TimingDiagram } from './timing-diagram';

/** A mode as typed ("800 x 600 @ 75") in the form the API stores ("800x600@75"); other text as it is. */
function canonicalMode(text: string): string {
  const parsed = parseMode(text);
  return parsed ? modeName(parsed) : text.trim();
}

/** The drive timing workbench: pick or enter a timing, see what the panel and the VGA need, save it. */
@Component({
  selector: 'em-drive-timing',
  imports: [
    ReactiveFormsModule,
    DecimalPipe,
    KeyValuePipe,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatSlideToggleModule,
    MatCheckboxModule,
    MatIconModule,
    SafetyNotice,
    RegisterTable,
    TimingDiagram,
    FrameDataCard,
  ],
  templateUrl: './drive-timing.html',
  styleUrl: './drive-timing.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DriveTiming {
  private readonly api = inject(TimingApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly confirm = inject(Confirm);
  protected readonly context = inject(StudioContext);

  protected readonly panelTypes = PANEL_TYPES;
  protected readonly fixedModes = [
    ...FIXED_TIMINGS.map((t) => ({
      value: t.name,
      label: `${t.name.replace(' RB', ', reduced blanking')} (${t.dmtId ? `VESA DMT ${hex2(t.dmtId)}h` : 'IBM VGA'})`,
    })),
    { value: 'vga-mode-03h', label: 'VGA BIOS mode 03h (80 × 25 text, 720×400, 9-dot)' },
    { value: 'vga-mode-12h', label: 'VGA BIOS mode 12h (640×480)' },
  ];
  protected readonly standards: { value: Standard; label: string }[] = [
    { value: 'dmt', label: 'Fixed timing (DMT / VGA)' },
    { value: 'cvt', label: 'CVT 1.2' },
    { value: 'cvt-rb', label: 'CVT reduced blanking' },
    { value: 'cvt-rb2', label: 'CVT reduced blanking v2' },
  ];
  protected readonly pixelsPerClock = PIXELS_PER_CLOCK;
  protected readonly form = inject(FormBuilder).nonNullable.group({
    // Empty until the user names it: a prefilled name would end up on every download.
    name: ['', [Validators.required, Validators.maxLength(80)]],
    panelTypeId: [DEFAULT_PANEL_TYPE_ID],
    kind: ['standard' as 'standard' | 'custom'],
    standard: ['dmt' as Standard],
    mode: ['640x480@60'],
    pixelClockMHz: [25.175],
    hActive: [640],
    hFront: [16],
    hSync: [96],
    hBack: [48],
    vActive: [480],
    vFront: [10],
    vSync: [2],
    vBack: [33],
    hSyncPositive: [false],
    vSyncPositive: [false],
    dualScan: [true],
    pixelsPerClockValue: [4 as PanelInterface['pixelsPerClock']],
  });
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly selectedId = signal<string | null>(null);
  protected readonly saving = signal(false);
  protected readonly saved = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.api.list(params) });

  protected readonly request = computed(() => this.requestOf({ ...this.form.getRawValue(), ...this.value() }));
  protected readonly result = computed(() => {
    try {
      const evaluation = evaluateTiming(this.request());
      let registers = null;
      let registerError = '';
      try {
        registers = vgaRegisters(evaluation.timing);
      } catch (err) {
        registerError = (err as Error).message;
      }
      return { ...evaluation, registers, registerError, vbe: vbeCrtcInfoBlock(evaluation.timing), error: '', field: null };
    } catch (err) {
      return { error: (err as Error).message, field: err instanceof VbeFieldRangeError ? err.field : null } as const;
    }
  });
  /**
   * For a timing by hand, the part of the form a too-wide VBE field comes from, so the message
   * stands beside the numbers that made it: 'h', 'v' or 'clock'.
   */
  protected readonly vbeProblemAt = computed(() => {
    const r = this.result();
    if (!r.field || this.value().kind !== 'custom') return null;
    return { at: r.field.startsWith('Horizontal') ? 'h' : r.field.startsWith('Vertical') ? 'v' : 'clock', message: r.error };
  });

  constructor() {
    // Switching standard keeps the mode where it still means something: a fixed mode the CVT
    // field can read ("640x480@60", never the VGA BIOS mode's own id), or a typed mode that is
    // also a fixed one; otherwise the first fixed mode, so the list never shows a blank.
    this.form.controls.standard.valueChanges.pipe(takeUntilDestroyed()).subscribe((standard) => {
      const mode = this.form.controls.mode.value;
      if (standard === 'dmt') {
        const parsed = parseMode(mode);
        const fixed = parsed && fixedTiming(modeName(parsed));
        this.form.controls.mode.setValue(BIOS_MODES.some((b) => b.name === mode) ? mode : fixed ? fixed.name : this.fixedModes[0].value);
      } else if (BIOS_MODES.some((b) => b.name === mode)) {
        this.form.controls.mode.setValue(mode === 'vga-mode-03h' ? '720x400@70' : '640x480@60');
      }
    });
  }
  /** Keeps the block's field order in the keyvalue pipe. */
  protected readonly keepOrder = () => 0;

  protected vbeHex(bytes: number[]): string {
    return bytes.map(hex2).join(' ');
  }

  protected load(t: SavedTimingDto): void {
    this.selectedId.set(t.id);
    const s = t.source;
    this.form.patchValue({
      name: t.name,
      panelTypeId: t.panelTypeId,
      kind: s.kind,
      dualScan: t.interface.dualScan,
      pixelsPerClockValue: t.interface.pixelsPerClock,
      ...(s.kind === 'standard'
        ? { standard: s.standard, mode: s.mode }
        : {
            pixelClockMHz: s.pixelClockMHz,
            hActive: s.h.active,
            hFront: s.h.frontPorch,
            hSync: s.h.sync,
            hBack: s.h.backPorch,
            vActive: s.v.active,
            vFront: s.v.frontPorch,
            vSync: s.v.sync,
            vBack: s.v.backPorch,
            hSyncPositive: s.hSyncPositive,
            vSyncPositive: s.vSyncPositive,
          }),
    });
  }

  protected startNew(): void {
    this.selectedId.set(null);
    this.form.controls.name.setValue(`${this.form.controls.name.value} (copy)`);
  }

  protected async saveTiming(): Promise<void> {
    if (this.form.invalid || ('error' in this.result() && this.result().error)) {
      this.form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    try {
      const id = this.selectedId();
      const body = this.request();
      const saved = id ? await this.api.update(this.context.studioId(), id, body) : await this.api.create(this.context.studioId(), body);
      this.selectedId.set(saved.id);
      this.saved.reload();
      this.snackBar.open(`Saved “${saved.name}”.`, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.saving.set(false);
    }
  }

  protected async deleteTiming(t: SavedTimingDto): Promise<void> {
    const confirmed = await this.confirm.ask({
      title: `Delete “${t.name}”?`,
      consequences: ['Nobody in the studio finds it here or on the bench any more.', 'This cannot be undone.'],
      action: 'Delete timing',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(this.context.studioId(), t.id);
      if (this.selectedId() === t.id) this.selectedId.set(null);
      this.saved.reload();
      this.snackBar.open(`Deleted “${t.name}”.`, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }

  private requestOf(v: ReturnType<typeof this.form.getRawValue>): CreateTimingBody {
    const source: TimingSource =
      v.kind === 'standard'
        ? { kind: 'standard', standard: v.standard, mode: canonicalMode(v.mode) }
        : {
            kind: 'custom',
            pixelClockMHz: Number(v.pixelClockMHz),
            h: { active: Number(v.hActive), frontPorch: Number(v.hFront), sync: Number(v.hSync), backPorch: Number(v.hBack) },
            v: { active: Number(v.vActive), frontPorch: Number(v.vFront), sync: Number(v.vSync), backPorch: Number(v.vBack) },
            hSyncPositive: v.hSyncPositive,
            vSyncPositive: v.vSyncPositive,
          };
    return {
      name: v.name.trim() || (v.kind === 'standard' ? `${v.mode} ${v.standard.toUpperCase()}` : 'Timing by hand'),
      panelTypeId: v.panelTypeId,
      source,
      interface: { dualScan: v.dualScan, pixelsPerClock: v.pixelsPerClockValue },
    };
  }
}
