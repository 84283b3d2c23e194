import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { RouterLink } from '@angular/router';

/** The centred card every account page sits in, with the brand above it. */
@Component({
  selector: 'em-account-frame',
  imports: [RouterLink],
  template: `
    <main class="frame">
      <a class="brand" routerLink="/" aria-label="Emberline home">
        <img src="assets/emberline-mark.svg" alt="" width="40" height="40" />
        <span>Emberline</span>
      </a>
      <section class="card" [attr.aria-labelledby]="'account-title'">
        <h1 id="account-title">{{ heading() }}</h1>
        @if (lead()) {
          <p class="lead">{{ lead() }}</p>
        }
        <ng-content />
      </section>
      <p class="tagline">Pixel art, as glowing panels really show it.</p>
    </main>
  `,
  styleUrl: './account-frame.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountFrame {
  readonly heading = input.required<string>();
  readonly lead = input<string>('');
}
