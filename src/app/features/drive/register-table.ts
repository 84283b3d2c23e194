import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { hex2, type VgaRegisters } from '../../../../shared/drive/registers';
import { downloadText } from './download';

/** CR00–CR18 and the misc register, each with its bit fields; copy as hex, download as JSON or text. */
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

  protected readonly hexLine = computed(() => this.registers().crtc.map((r) => hex2(r.value)).join(' '));
  protected readonly hex = hex2;

  protected async copyHex(): Promise<void> {
    const text = `${this.hexLine()}\nmisc ${hex2(this.registers().misc.value)}`;
    try {
      await navigator.clipboard.writeText(text);
      this.snackBar.open('Register values copied.', undefined, { duration: 3000 });
    } catch {
      this.snackBar.open('The browser refused clipboard access; select the hex line and copy it instead.', 'Dismiss', { duration: 6000 });
    }
  }

  protected downloadJson(): void {
    const r = this.registers();
    const doc = { crtc: r.crtc.map((f) => hex2(f.value)), misc: hex2(r.misc.value), fields: [...r.crtc, r.misc], notes: r.notes };
    downloadText(`${this.name()}-registers.json`, JSON.stringify(doc, null, 2), 'application/json');
  }

  protected downloadText(): void {
    const r = this.registers();
    const lines = [...r.crtc, r.misc].map((f) => `${f.index === 0x3c2 ? 'misc' : `CR${hex2(f.index)}`} = ${hex2(f.value)}  ${f.name}\n${f.bits.map((b) => `    [${b.range}] ${b.meaning}`).join('\n')}`);
    downloadText(`${this.name()}-registers.txt`, [`${this.name()} — VGA CRT controller`, ...r.notes, '', ...lines].join('\n'), 'text/plain');
  }
}
