import { ChangeDetectionStrategy, Component, Injectable, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { firstValueFrom } from 'rxjs';

/** What a destructive action asks before it runs. */
export interface ConfirmRequest {
  /** "Delete “Kiln sign”?" */
  title: string;
  /** What goes with it, one line each ("Its 3 share links stop working."). */
  consequences: string[];
  /** The button that does it, named for what it does ("Delete artwork"). */
  action: string;
}

/** A dialog that names what a destructive action takes with it; Cancel has the focus. */
@Component({
  selector: 'em-confirm-dialog',
  imports: [MatDialogModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <mat-dialog-content>
      <ul class="consequences">
        @for (c of data.consequences; track c) {
          <li>{{ c }}</li>
        }
      </ul>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button [mat-dialog-close]="false" cdkFocusInitial>Cancel</button>
      <button mat-flat-button class="danger" [mat-dialog-close]="true">{{ data.action }}</button>
    </mat-dialog-actions>
  `,
  styles: `
    .consequences {
      margin: 0;
      padding-left: 20px;
      display: grid;
      gap: 6px;
    }
    .danger {
      --mat-button-filled-container-color: var(--mat-sys-error);
      --mat-button-filled-label-text-color: var(--mat-sys-on-error);
    }
  `,
})
export class ConfirmDialog {
  protected readonly data = inject<ConfirmRequest>(MAT_DIALOG_DATA);
}

/** Asks before a destructive action: resolves true only when the user confirms. */
@Injectable({ providedIn: 'root' })
export class Confirm {
  private readonly dialog = inject(MatDialog);

  async ask(request: ConfirmRequest): Promise<boolean> {
    const ref = this.dialog.open<ConfirmDialog, ConfirmRequest, boolean>(ConfirmDialog, {
      data: request,
      width: '440px',
      maxWidth: 'calc(100vw - 32px)',
      role: 'alertdialog',
      ariaLabel: request.title,
    });
    return (await firstValueFrom(ref.afterClosed())) === true;
  }
}
