import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
  });

  test('shows field errors and sends nothing while the form is invalid', async () => {
    const fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
    const form: HTMLFormElement = fixture.nativeElement.querySelector('form');
    form.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
    expect(fixture.nativeElement.textContent).toContain('Enter your e-mail address.');
    expect(fixture.nativeElement.textContent).toContain('Enter your password.');
    TestBed.inject(HttpTestingController).expectNone('/api/auth/sign-in');
  });

  test("shows the server's message when the credentials are refused", async () => {
    const fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    const type = (selector: string, value: string) => {
      const input = el.querySelector<HTMLInputElement>(selector)!;
      input.value = value;
      input.dispatchEvent(new Event('input'));
    };
    type('input[type=email]', 'someone@example.com');
    type('input[type=password]', 'wrong password');
    el.querySelector('form')!.dispatchEvent(new Event('submit'));
    const http = TestBed.inject(HttpTestingController);
    const req = http.expectOne('/api/auth/sign-in');
    expect(req.request.body).toEqual({ email: 'someone@example.com', password: 'wrong password' });
    req.flush(
      { error: { code: 'bad_credentials', message: 'The e-mail or password is not right.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[role=alert]')!.textContent).toContain('The e-mail or password is not right.');
    expect(TestBed.inject(Router).url).toBe('/');
  });
});
