import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, effect, inject, input, resource } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatToolbarModule } from '@angular/material/toolbar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { apiErrorCode, apiErrorMessage } from '../../core/api-error';
import { AuthStore } from '../../core/auth-store';
import { StudioApi } from './studio-api';
import { StudioContext } from './studio-context';

/** The signed-in layout: top bar with studio switcher and account menu, navigation, page outlet. */
@Component({
  selector: 'em-studio-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbarModule,
    MatSidenavModule,
    MatListModule,
    MatIconModule,
    MatButtonModule,
    MatMenuModule,
    MatDividerModule,
    MatProgressBarModule,
    MatTooltipModule,
  ],
  templateUrl: './studio-shell.html',
  styleUrl: './studio-shell.scss',
  providers: [StudioContext],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudioShell {
  private readonly api = inject(StudioApi);
  private readonly router = inject(Router);
  protected readonly auth = inject(AuthStore);
  protected readonly context = inject(StudioContext);

  readonly studioId = input.required<string>();

  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe('(max-width: 840px)')
      .pipe(map((s) => s.matches)),
    { initialValue: false },
  );
  protected readonly studio = resource({ params: () => this.studioId(), loader: ({ params }) => this.api.get(params) });
  protected readonly nav = [
    { path: 'bench', label: 'Bench', icon: 'blur_on' },
    { path: 'presets', label: 'Presets', icon: 'tune' },
    { path: 'artworks', label: 'Artworks', icon: 'photo_library' },
    { path: 'exports', label: 'Exports', icon: 'collections' },
    { path: 'match', label: 'Panel match', icon: 'center_focus_strong' },
    { path: 'drive', label: 'Drive timing', icon: 'timeline' },
    { path: 'bios', label: 'Video BIOS', icon: 'memory' },
    { path: 'members', label: 'Members', icon: 'group' },
    { path: 'activity', label: 'Activity', icon: 'history' },
  ];

  constructor() {
    effect(() => {
      const studio = this.studio.hasValue() ? this.studio.value() : null;
      this.context.studio.set(studio);
      if (studio) this.auth.rememberStudio(studio.id);
    });
  }

  /** The skip link: past the bar and the navigation, straight to the page's own content. */
  protected skipToContent(event: Event): void {
    event.preventDefault();
    document.getElementById('page-content')?.focus();
  }

  protected errorText(): string {
    const err = this.studio.error();
    // Non-members get the same 404 as for a missing studio (no oracle); this browser knows better.
    if (apiErrorCode(err) === 'not_found' && this.auth.wasMemberOf(this.studioId())) {
      return 'You are no longer a member of this studio. An owner can invite you again.';
    }
    return apiErrorMessage(err);
  }

  protected async signOut(): Promise<void> {
    await this.auth.signOut();
    await this.router.navigateByUrl('/sign-in');
  }
}
