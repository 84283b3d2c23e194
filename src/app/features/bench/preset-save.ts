import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { PresetDto } from '@shared/api/dto';
import type { PanelParams } from '@shared/model/parameters';
import { apiErrorCode, apiErrorMessage } from '../../core/api-error';
import { PresetApi } from '../presets/preset-api';

/**
 * Keeps the tuning on the bench: as the studio preset's next revision (when the caller may
 * change it), or as a new preset by name.
 */
@Component({
  selector: 'em-preset-save',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    @let preset = studioPreset();
    @if (preset && mayChange()) {
      <button mat-flat-button (click)="saveRevision(preset)" [disabled]="!dirty() || saving()">
        <mat-icon>save</mat-icon> Save as revision {{ preset.revision + 1 }}
      </button>
    } @else if (preset?.isReference) {
      <p class="sub">The reference look: only owners change it.</p>
    }
    <div class="save-new">
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>New preset name</mat-label>
        <input matInput [ngModel]="newName()" (ngModelChange)="newName.set($event)" (keydown.enter)="saveAsNew()" />
      </mat-form-field>
      <button mat-stroked-button (click)="saveAsNew()" [disabled]="!newName().trim() || saving()">Save as new</button>
    </div>
  `,
  styles: `
    :host {
      display: flex;
      flex-direction: column;
      gap: 8px;
      margin-bottom: 12px;
    }
    .save-new {
      display: flex;
      gap: 8px;
      align-items: center;
    }
    .save-new mat-form-field {
      flex: 1;
    }
    .sub {
      margin: 0;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetSave {
  private readonly api = inject(PresetApi);
  private readonly snackBar = inject(MatSnackBar);

  readonly studioId = input.required<string>();
  readonly panelTypeId = input.required<string>();
  readonly params = input.required<PanelParams>();
  /** The studio preset open on the bench, if one is. */
  readonly studioPreset = input<PresetDto | undefined>();
  /** May the caller save revisions of it (editors; owners for the reference look)? */
  readonly mayChange = input(false);
  readonly dirty = input(false);
  /** A revision was saved, or a preset created: the bench shows it. */
  readonly saved = output<PresetDto>();
  readonly created = output<PresetDto>();
  /** Someone saved the preset since it was opened: the bench reloads the list. */
  readonly stale = output<void>();

  protected readonly newName = signal('');
  protected readonly saving = signal(false);

  /** Saves the current parameters as the preset's next revision (409: someone was faster). */
  protected async saveRevision(preset: PresetDto): Promise<void> {
    this.saving.set(true);
    try {
      const saved = await this.api.save(this.studioId(), preset.id, { baseRevision: preset.revision, parameters: this.params() });
      this.saved.emit(saved);
      this.snackBar.open(`Saved “${saved.name}” as revision ${saved.revision}.`, undefined, { duration: 3000 });
    } catch (err) {
      if (apiErrorCode(err) === 'stale_revision') this.stale.emit();
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 10000 });
    } finally {
      this.saving.set(false);
    }
  }

  protected async saveAsNew(): Promise<void> {
    const name = this.newName().trim();
    if (!name) return;
    this.saving.set(true);
    try {
      const created = await this.api.create(this.studioId(), { name, panelTypeId: this.panelTypeId(), parameters: this.params() });
      this.created.emit(created);
      this.newName.set('');
      this.snackBar.open(`Created preset “${created.name}”.`, undefined, { duration: 3000 });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 8000 });
    } finally {
      this.saving.set(false);
    }
  }
}
