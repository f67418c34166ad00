import { ChangeDetectionStrategy, Component, ElementRef, inject, signal, viewChild } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';
import { errorText } from '../api/error-text';
import { SafetyNote } from '../shell/safety-note';
import { Session } from './session';

/** The sign-in page: email and password against `POST /api/auth/login`. */
@Component({
  selector: 'tw-sign-in',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, SafetyNote],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly session = inject(Session);
  private readonly router = inject(Router);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', Validators.required],
  });
  protected readonly submitting = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly notice = this.session.notice;
  private readonly passwordInput = viewChild<ElementRef<HTMLInputElement>>('password');
  private readonly emailInput = viewChild<ElementRef<HTMLInputElement>>('email');

  protected async signIn(): Promise<void> {
    if (this.submitting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      (this.form.controls.email.invalid ? this.emailInput() : this.passwordInput())?.nativeElement.focus();
      return;
    }
    const { email, password } = this.form.getRawValue();
    this.submitting.set(true);
    this.failure.set(null);
    this.form.disable();
    try {
      await this.session.signIn(email.trim(), password);
      await this.router.navigate(['/']);
    } catch (err) {
      this.failure.set(errorText(err));
      this.form.enable();
      // The inputs lost the focus while disabled: put it back where the person retypes.
      setTimeout(() => this.passwordInput()?.nativeElement.select());
    } finally {
      this.submitting.set(false);
    }
  }
}
