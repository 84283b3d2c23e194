import { DatePipe, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { SHEET_LAYOUT_LABELS } from '@shared/export/sheet';
import { apiErrorMessage } from '../../core/api-error';
import { formatBytes } from '../../core/format-bytes';
import { ExportApi } from '../exports/export-api';
import { ShareHeader } from './share-header';

/** What an export's share link opens: the sheet to look at, or an animation's facts, and the files. Read-only, no account. */
@Component({
  selector: 'em-shared-export',
  imports: [DatePipe, DecimalPipe, MatButtonModule, MatIconModule, MatProgressBarModule, ShareHeader],
  template: `
    <main class="wrap">
      <header><em-share-header what="Shared export" /></header>
      @if (shared.isLoading()) {
        <mat-progress-bar mode="indeterminate" aria-label="Loading the shared export" />
      } @else if (shared.error()) {
        <section class="state" role="alert">
          <h1>This link does not open anything</h1>
          <p>{{ errorText() }} It may have expired or been revoked; ask whoever sent it for a new one.</p>
        </section>
      } @else if (shared.hasValue()) {
        @let e = shared.value();
        <h1>{{ e.title }}</h1>
        <p class="sub">
          {{ e.studioName }} · {{ e.layout ? layoutLabels[e.layout] : 'Animation' }} · {{ e.createdAt | date: 'mediumDate' }}
        </p>
        <p class="sub">Artworks: {{ e.artworks.join(', ') }} · Looks: {{ looks() }}</p>
        @if (e.previewUrl) {
          <figure class="stage">
            <img [src]="e.previewUrl" [attr.width]="e.width" [attr.height]="e.height" [alt]="'Comparison sheet: ' + e.title" />
          </figure>
        }
        @for (f of e.figures ?? []; track f.artworkName) {
          <p class="sub em-num">
            {{ f.artworkName }}: {{ f.differing | number }} of {{ f.pixels | number }} pixels differ, largest channel difference
            {{ f.maxChannel }}
          </p>
        }
        @if (e.animation; as a) {
          <p class="sub">
            {{ a.frames }} frames, {{ a.durationMs / 1000 | number: '1.1-1' }} s a loop, {{ e.width }} × {{ e.height }} px. Download it to
            play it.
          </p>
          @if (a.flash; as flash) {
            <p class="flash" [class.fails]="!flash.pass" role="note">
              <mat-icon aria-hidden="true">{{ flash.pass ? 'check_circle' : 'warning' }}</mat-icon>
              <span
                >Flash check at {{ flash.distanceMm | number }} mm:
                {{
                  flash.pass
                    ? 'passes'
                    : 'fails — this animation flashes more than the usual guidance allows; people with photosensitive epilepsy should not watch it'
                }}
                (at most {{ flash.maxFlashesPerSecond }} flashes a second in one place). The check informs, it does not certify.</span
              >
            </p>
          }
        }
        <div class="files">
          @for (f of e.files; track f.format) {
            <a mat-stroked-button [href]="f.url" download [attr.aria-label]="'Download ' + f.label + ', ' + size(f.bytes)"
              ><mat-icon>download</mat-icon> {{ f.label }} · {{ size(f.bytes) }}</a
            >
          }
        </div>
      }
    </main>
  `,
  styles: `
    .wrap {
      max-width: 1200px;
      margin: 0 auto;
      padding: 20px 16px 48px;
    }
    h1 {
      font: var(--mat-sys-headline-medium);
      overflow-wrap: anywhere;
    }
    .sub {
      color: var(--mat-sys-on-surface-variant);
      overflow-wrap: anywhere;
    }
    .stage {
      margin: 16px 0;
      padding: 8px;
      background: #090807;
      border-radius: var(--mat-sys-corner-medium);
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .stage img {
      display: block;
      width: 100%;
      height: auto;
      image-rendering: pixelated;
    }
    .state {
      padding: 48px 0;
    }
    .files {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      margin-top: 16px;
    }
    .flash {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      color: var(--mat-sys-on-surface-variant);
    }
    .flash mat-icon {
      color: var(--mat-sys-primary);
      flex: none;
    }
    .flash.fails {
      color: var(--mat-sys-on-surface);
    }
    .flash.fails mat-icon {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedExport {
  private readonly api = inject(ExportApi);

  readonly token = input.required<string>();

  protected readonly layoutLabels = SHEET_LAYOUT_LABELS;
  protected readonly size = formatBytes;
  protected readonly shared = resource({ params: () => this.token(), loader: ({ params }) => this.api.shared(params) });
  protected readonly errorText = () => apiErrorMessage(this.shared.error());
  protected looks(): string {
    return this.shared.hasValue()
      ? this.shared
          .value()
          .looks.map((l) => `${l.name}${l.revision ? ` r${l.revision}` : ''} (${l.panelTypeName})`)
          .join(', ')
      : '';
  }
}
