import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { StudioContext } from '../studio/studio-context';

/** The bench: where artwork is previewed on a simulated panel. */
@Component({
  selector: 'em-bench',
  imports: [MatIconModule],
  templateUrl: './bench.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Bench {
  protected readonly context = inject(StudioContext);
  /** A 12 × 8 cell pattern (an ember glyph) for the empty state's panel illustration. */
  protected readonly cells = Array.from({ length: 96 }, (_, i) => {
    const x = i % 12;
    const y = Math.floor(i / 12);
    return (y === 1 || y === 6) ? x > 2 && x < 9 : (x === 3 && y > 1 && y < 6) || (y === 3 && x > 2 && x < 8);
  });
}
