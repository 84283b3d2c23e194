import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { AccountFrame } from './account-frame';

/** Any unknown address. */
@Component({
  selector: 'em-not-found',
  imports: [AccountFrame, RouterLink, MatButtonModule],
  template: `
    <em-account-frame heading="Nothing lit here" lead="This address does not lead to a page.">
      <a mat-flat-button routerLink="/">Go to your studio</a>
    </em-account-frame>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFound {}
