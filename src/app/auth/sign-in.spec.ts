import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { provideRouter } from '@angular/router';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { authInterceptor } from './auth-interceptor';
import { Session } from './session';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let http: HttpTestingController;

  beforeEach(async () => {
    localStorage.clear();
    TestBed.configureTestingModule({
      providers: [provideRouter([{ path: '**', children: [] }]), provideHttpClient(withInterceptors([authInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
  });

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  async function input(label: string): Promise<MatInputHarness> {
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatInputHarness))!;
  }

  async function submit(email: string, password: string): Promise<MatButtonHarness> {
    await (await input('Email')).setValue(email);
    await (await input('Password')).setValue(password);
    const button = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatButtonHarness.with({ text: 'Sign in' }));
    await button.click();
    return button;
  }

  /** Lets the sign-in's promise chain finish, then renders. */
  async function settled(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  }

  function alertText(): string | null {
    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role="alert"]');
    return alert ? alert.textContent!.replace('error', '').trim() : null;
  }

  it('shows the error text the server sends when it refuses the sign-in', async () => {
    await submit('operator@tiltwatch.example', 'wrong');
    http.expectOne('/api/auth/login').flush({ error: 'Wrong email or password.' }, { status: 401, statusText: 'Unauthorized' });
    await settled();
    expect(alertText()).toBe('Wrong email or password.');
  });

  it('shows the message field of a rate-limit answer', async () => {
    await submit('operator@tiltwatch.example', 'wrong');
    http.expectOne('/api/auth/login').flush({ message: 'Too many sign-in attempts; wait 60 s.' }, { status: 429, statusText: 'Too Many Requests' });
    await settled();
    expect(alertText()).toBe('Too many sign-in attempts; wait 60 s.');
  });

  it('says what to check when the server cannot be reached', async () => {
    await submit('operator@tiltwatch.example', 'secret');
    http.expectOne('/api/auth/login').error(new ProgressEvent('error'));
    await settled();
    expect(alertText()).toMatch(/Cannot reach the Tiltwatch server/);
  });

  it('disables the button while the sign-in is on its way and enables it again after a refusal', async () => {
    const button = await submit('operator@tiltwatch.example', 'wrong');
    expect(await button.isDisabled()).toBe(true);
    http.expectOne('/api/auth/login').flush({ error: 'Wrong email or password.' }, { status: 401, statusText: 'Unauthorized' });
    await settled();
    expect(await button.isDisabled()).toBe(false);
  });

  it('does not send a malformed email address and says what is wrong with it', async () => {
    await submit('operator-at-lab', 'secret');
    http.expectNone('/api/auth/login');
    const field = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Email' }));
    expect(await field.getTextErrors()).toEqual([expect.stringMatching(/does not look like an email address/)]);
  });

  it('shows why the previous session ended', async () => {
    TestBed.inject(Session).notice.set('Your session expired. Sign in again to continue.');
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[role="status"]')?.textContent).toContain('Your session expired.');
  });
});
