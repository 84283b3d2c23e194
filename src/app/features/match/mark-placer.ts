import { ChangeDetectionStrategy, Component, effect, ElementRef, input, model, signal, viewChild } from '@angular/core';
import { MARK_NAMES } from '@shared/match/pattern';

type Mark = [number, number];
/** Photo pixels the magnifier shows across (its canvas is 4 times that). */
const LOUPE_SPAN = 44;

/**
 * The photo with four draggable marks, one per corner square of the pattern, and a magnifier
 * around the mark in hand. Marks are in photo pixels; a pointer drags them, arrow keys move the
 * focused one a pixel at a time (ten with Shift).
 */
@Component({
  selector: 'em-mark-placer',
  template: `
    <div class="stage" #stage>
      <img #photo [src]="src()" alt="Your photo of the panel showing the match pattern" draggable="false" (load)="loaded.set(true)" />
      @for (m of marks(); track $index) {
        <button
          type="button"
          class="mark"
          [class.active]="active() === $index"
          [class.label-left]="m[0] / width() > 0.85"
          [style.left.%]="(m[0] / width()) * 100"
          [style.top.%]="(m[1] / height()) * 100"
          [disabled]="disabled()"
          [attr.aria-label]="label($index, m)"
          (pointerdown)="grab($event, $index)"
          (pointermove)="drag($event, $index)"
          (pointerup)="dragging = false"
          (keydown)="nudge($event, $index)"
          (focus)="active.set($index)"
        >
          <span aria-hidden="true">{{ $index + 1 }}</span>
        </button>
      }
    </div>
    <figure class="loupe-box">
      <canvas #loupe class="loupe" [width]="loupeSize" [height]="loupeSize" aria-hidden="true"></canvas>
      <figcaption>{{ names[active()] }} mark · {{ marks()[active()][0].toFixed(1) }}, {{ marks()[active()][1].toFixed(1) }} px</figcaption>
    </figure>
  `,
  styles: `
    :host {
      display: grid;
      grid-template-columns: minmax(0, 1fr) 196px;
      gap: 16px;
      align-items: start;
    }
    @media (max-width: 700px) {
      :host {
        grid-template-columns: 1fr;
      }
    }
    .stage {
      position: relative;
      touch-action: none;
      user-select: none;
      line-height: 0;
      border-radius: var(--mat-sys-corner-small);
      overflow: hidden;
      background: #000;
    }
    img {
      width: 100%;
      height: auto;
      display: block;
    }
    .mark {
      position: absolute;
      width: 28px;
      height: 28px;
      margin: -14px 0 0 -14px;
      padding: 0;
      border-radius: 50%;
      border: 2px solid var(--mat-sys-primary);
      background: color-mix(in srgb, var(--mat-sys-primary) 18%, transparent);
      color: var(--mat-sys-on-primary);
      cursor: grab;
      font: var(--mat-sys-label-small);
      line-height: 1;
    }
    .mark::after {
      content: '';
      position: absolute;
      left: 50%;
      top: 50%;
      width: 4px;
      height: 4px;
      margin: -2px 0 0 -2px;
      border-radius: 50%;
      background: var(--mat-sys-primary);
    }
    .mark span {
      position: absolute;
      left: 26px;
      top: -8px;
      padding: 1px 5px;
      border-radius: 8px;
      background: var(--mat-sys-primary);
    }
    .mark.label-left span {
      left: auto;
      right: 26px;
    }
    .mark.active {
      border-color: var(--mat-sys-tertiary);
      box-shadow: 0 0 0 3px color-mix(in srgb, var(--mat-sys-tertiary) 40%, transparent);
    }
    .mark:focus-visible {
      outline: 3px solid var(--mat-sys-tertiary);
      outline-offset: 2px;
    }
    .loupe-box {
      margin: 0;
      display: grid;
      gap: 6px;
      justify-items: center;
    }
    .loupe {
      width: 176px;
      height: 176px;
      border-radius: 50%;
      border: 2px solid var(--mat-sys-outline);
      background: #000;
      image-rendering: pixelated;
    }
    figcaption {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
      text-align: center;
      font-variant-numeric: tabular-nums;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MarkPlacer {
  readonly src = input.required<string>();
  /** The photo's size in pixels (upright). */
  readonly width = input.required<number>();
  readonly height = input.required<number>();
  readonly disabled = input(false);
  readonly marks = model.required<Mark[]>();

  protected readonly names = MARK_NAMES;
  protected readonly loupeSize = LOUPE_SPAN * 4;
  protected readonly active = signal(0);
  protected readonly loaded = signal(false);
  protected dragging = false;
  private readonly stage = viewChild.required<ElementRef<HTMLElement>>('stage');
  private readonly photo = viewChild.required<ElementRef<HTMLImageElement>>('photo');
  private readonly loupe = viewChild.required<ElementRef<HTMLCanvasElement>>('loupe');

  constructor() {
    // The magnifier follows the mark in hand.
    effect(() => {
      const [x, y] = this.marks()[this.active()];
      if (!this.loaded()) return;
      const ctx = this.loupe().nativeElement.getContext('2d');
      if (!ctx) return;
      const size = this.loupeSize;
      ctx.imageSmoothingEnabled = false;
      ctx.fillStyle = '#000';
      ctx.fillRect(0, 0, size, size);
      ctx.drawImage(this.photo().nativeElement, x - LOUPE_SPAN / 2, y - LOUPE_SPAN / 2, LOUPE_SPAN, LOUPE_SPAN, 0, 0, size, size);
      ctx.strokeStyle = 'rgba(120, 200, 255, 0.9)';
      ctx.lineWidth = 1;
      ctx.beginPath();
      ctx.moveTo(size / 2, 0);
      ctx.lineTo(size / 2, size);
      ctx.moveTo(0, size / 2);
      ctx.lineTo(size, size / 2);
      ctx.stroke();
    });
  }

  protected label(i: number, [x, y]: Mark): string {
    return `${MARK_NAMES[i]} mark at ${Math.round(x)}, ${Math.round(y)} px: drag it, or use the arrow keys (Shift for 10 px)`;
  }

  protected grab(event: PointerEvent, i: number): void {
    if (this.disabled()) return;
    this.active.set(i);
    this.dragging = true;
    (event.target as HTMLElement).setPointerCapture?.(event.pointerId);
    event.preventDefault();
    (event.currentTarget as HTMLElement).focus({ preventScroll: true });
  }

  protected drag(event: PointerEvent, i: number): void {
    if (!this.dragging || this.active() !== i) return;
    const box = this.stage().nativeElement.getBoundingClientRect();
    const x = ((event.clientX - box.left) / box.width) * this.width();
    const y = ((event.clientY - box.top) / box.height) * this.height();
    this.move(i, x, y);
  }

  protected nudge(event: KeyboardEvent, i: number): void {
    const step = event.shiftKey ? 10 : 1;
    const by: Record<string, Mark> = { ArrowLeft: [-step, 0], ArrowRight: [step, 0], ArrowUp: [0, -step], ArrowDown: [0, step] };
    const d = by[event.key];
    if (!d) return;
    event.preventDefault();
    const [x, y] = this.marks()[i];
    this.move(i, x + d[0], y + d[1]);
  }

  private move(i: number, x: number, y: number): void {
    const clamped: Mark = [Math.min(this.width(), Math.max(0, x)), Math.min(this.height(), Math.max(0, y))];
    this.marks.update((all) => all.map((m, k) => (k === i ? clamped : m)));
  }
}
