import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { hex2, type VgaRegisters } from '@shared/drive/registers';
import { downloadText } from './download';

/** CR00–CR18, the misc register and SR01–SR04, each with its bit fields; copy as hex, download as JSON or text. */
@Component({
  selector: 'em-register-table',
  imports: [MatButtonModule, MatIconModule, MatExpansionModule],
  templateUrl: './register-table.html',
  styleUrl: './register-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RegisterTable {
  private readonly snackBar = inject(MatSnackBar);

  readonly registers = input.required<VgaRegisters>();
  readonly name = input<string>('timing');

  protected readonly hexLine = computed(() =>
    this.registers()
      .crtc.map((r) => hex2(r.value))
      .join(' '),
  );
  protected readonly sequencerLine = computed(() =>
    this.registers()
      .sequencer.map((r) => hex2(r.value))
      .join(' '),
  );
  /** The misc register and the sequencer, each with the label a register table gives it. */
  protected readonly others = computed(() => [
    { label: '3C2', field: this.registers().misc },
    ...this.registers().sequencer.map((f) => ({ label: `SR${hex2(f.index)}`, field: f })),
  ]);
  protected readonly hex = hex2;

  protected async copyHex(): Promise<void> {
    const text = `${this.hexLine()}\nmisc ${hex2(this.registers().misc.value)}\nsequencer ${this.sequencerLine()}`;
    try {
      await navigator.clipboard.writeText(text);
      this.snackBar.open('Register values copied.', undefined, { duration: 3000 });
    } catch {
      this.snackBar.open('The browser refused clipboard access; select the hex line and copy it instead.', 'Dismiss', { duration: 6000 });
    }
  }

  protected downloadJson(): void {
    const r = this.registers();
    const doc = {
      crtc: r.crtc.map((f) => hex2(f.value)),
      misc: hex2(r.misc.value),
      sequencer: r.sequencer.map((f) => hex2(f.value)),
      layout: r.layout,
      fields: [...r.crtc, r.misc, ...r.sequencer],
      notes: r.notes,
    };
    downloadText(`${this.name()}-registers.json`, JSON.stringify(doc, null, 2), 'application/json');
  }

  protected downloadText(): void {
    const r = this.registers();
    const labelled = [
      ...r.crtc.map((f) => [`CR${hex2(f.index)}`, f] as const),
      ['misc', r.misc] as const,
      ...r.sequencer.map((f) => [`SR${hex2(f.index)}`, f] as const),
    ];
    const lines = labelled.map(
      ([label, f]) => `${label} = ${hex2(f.value)}  ${f.name}\n${f.bits.map((b) => `    [${b.range}] ${b.meaning}`).join('\n')}`,
    );
    downloadText(
      `${this.name()}-registers.txt`,
      [`${this.name()} — VGA CRT controller`, ...r.notes, '', ...lines].join('\n'),
      'text/plain',
    );
  }
}
