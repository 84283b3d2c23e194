import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, resource } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { PresetApi } from '../presets/preset-api';
import { StudioContext } from './studio-context';

const ICONS: Record<string, string> = {
  preset: 'tune',
  member: 'group',
  link: 'link',
  invite: 'mail',
  artwork: 'image',
  export: 'collections',
};

/** The studio's activity feed: who did what, when. */
@Component({
  selector: 'em-activity',
  imports: [DatePipe, MatIconModule, MatProgressBarModule],
  template: `
    <h1>Activity</h1>
    <p class="sub">Changes to presets, artworks, exports, people and share links in {{ context.studio()?.name }}.</p>
    @if (feed.isLoading()) {
      <mat-progress-bar mode="indeterminate" aria-label="Loading activity" />
    } @else if (feed.hasValue() && feed.value().length === 0) {
      <p class="sub">Nothing has happened here yet.</p>
    } @else if (feed.hasValue()) {
      <ol class="feed" aria-label="Activity">
        @for (a of feed.value(); track a.id) {
          <li>
            <mat-icon aria-hidden="true">{{ icon(a.kind) }}</mat-icon>
            <span
              ><strong>{{ a.actor ?? 'Someone' }}</strong> {{ a.summary }}</span
            >
            <time class="sub">{{ a.createdAt | date: 'medium' }}</time>
          </li>
        }
      </ol>
    }
  `,
  styles: `
    h1 {
      font: var(--mat-sys-headline-medium);
    }
    .sub {
      color: var(--mat-sys-on-surface-variant);
    }
    .feed {
      list-style: none;
      padding: 0;
      margin: 16px 0;
    }
    .feed li {
      display: grid;
      grid-template-columns: 32px 1fr auto;
      gap: 8px;
      align-items: center;
      padding: 10px 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    mat-icon {
      color: var(--mat-sys-primary);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Activity {
  private readonly api = inject(PresetApi);
  protected readonly context = inject(StudioContext);
  protected readonly feed = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.api.activity(params) });
  protected icon(kind: string): string {
    return ICONS[kind.split('.')[0]] ?? 'history';
  }
}
