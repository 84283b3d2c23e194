import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { ExportDto } from '@shared/api/export.schema';
import { apiErrorMessage } from '../../core/api-error';
import { StudioContext } from '../studio/studio-context';
import { ExportApi } from './export-api';

/** An export's read-only share links: make one (with an expiry), copy it once, revoke any. */
@Component({
  selector: 'em-export-links',
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule],
  template: `
    <div class="make">
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Link works for</mat-label>
        <mat-select [value]="days()" (selectionChange)="days.set($event.value)">
          <mat-option [value]="1">1 day</mat-option>
          <mat-option [value]="7">7 days</mat-option>
          <mat-option [value]="30">30 days</mat-option>
          <mat-option [value]="0">Until revoked</mat-option>
        </mat-select>
      </mat-form-field>
      <button mat-stroked-button type="button" (click)="make()" [disabled]="busy()"><mat-icon>add_link</mat-icon> New share link</button>
    </div>
    @if (madeUrl(); as url) {
      <div class="made" role="status">
        <input readonly [value]="url" aria-label="The new share link (shown once)" #field (focus)="field.select()" />
        <button mat-flat-button type="button" (click)="copy(url)"><mat-icon>content_copy</mat-icon> Copy</button>
      </div>
      <p class="hint">
        Anyone with this link sees the export read-only and can download its files, without an account. It is shown only now.
      </p>
    }
    @if (links.hasValue() && links.value().length) {
      <ul class="links" aria-label="Share links">
        @for (l of links.value(); track l.id) {
          <li [class.gone]="l.revokedAt">
            <span
              >Made {{ l.createdAt | date: 'medium' }} ·
              {{ l.revokedAt ? 'revoked' : l.expiresAt ? 'works until ' + (l.expiresAt | date: 'medium') : 'works until revoked' }}</span
            >
            @if (!l.revokedAt) {
              <button
                mat-button
                type="button"
                (click)="revoke(l.id)"
                [attr.aria-label]="'Revoke the link made ' + (l.createdAt | date: 'medium')"
              >
                <mat-icon>link_off</mat-icon> Revoke
              </button>
            }
          </li>
        }
      </ul>
    }
  `,
  styles: `
    :host {
      display: block;
      padding: 8px 0;
      border-top: 1px solid var(--mat-sys-outline-variant);
      margin-top: 8px;
    }
    .make,
    .made {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
    }
    .made {
      margin-top: 8px;
    }
    .made input {
      flex: 1 1 260px;
      min-width: 0;
      font: var(--mat-sys-body-small);
      padding: 8px;
      background: var(--mat-sys-surface-container-highest);
      color: var(--mat-sys-on-surface);
      border: 1px solid var(--mat-sys-primary);
      border-radius: 4px;
    }
    .hint,
    .links {
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    .links {
      list-style: none;
      padding: 0;
      margin: 8px 0 0;
    }
    .links li {
      display: flex;
      flex-wrap: wrap;
      justify-content: space-between;
      align-items: center;
      gap: 4px 8px;
    }
    .links li.gone {
      opacity: 0.6;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportLinks {
  private readonly api = inject(ExportApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly context = inject(StudioContext);

  readonly export = input.required<ExportDto>();

  protected readonly days = signal(7);
  protected readonly busy = signal(false);
  protected readonly madeUrl = signal('');
  protected readonly links = resource({
    params: () => ({ studioId: this.context.studioId(), id: this.export().id }),
    loader: ({ params }) => this.api.links(params.studioId, params.id),
  });

  protected async make(): Promise<void> {
    this.busy.set(true);
    try {
      const link = await this.api.createLink(this.context.studioId(), this.export().id, this.days() || null);
      this.madeUrl.set(link.url ?? '');
      this.links.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.busy.set(false);
    }
  }

  protected async copy(url: string): Promise<void> {
    try {
      await navigator.clipboard.writeText(url);
      this.snackBar.open('Link copied.', undefined, { duration: 2500 });
    } catch {
      this.snackBar.open('The browser did not allow copying: select the link and copy it by hand.', 'Dismiss', { duration: 6000 });
    }
  }

  protected async revoke(linkId: string): Promise<void> {
    try {
      await this.api.revokeLink(this.context.studioId(), this.export().id, linkId);
      this.snackBar.open('Link revoked: it no longer opens anything.', undefined, { duration: 3000 });
      this.links.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    }
  }
}
