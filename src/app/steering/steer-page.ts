import { ChangeDetectionStrategy, Component, computed, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { hasRole } from '../../../shared/auth/roles';
import type { PreflightResult, SteerTargetRequest } from '../../../shared/steering/steering-api';
import { fieldMessage, markField, markFields, placeServerError } from '../api/field-errors';
import { Session } from '../auth/session';
import { LiveFeed } from '../feed/live-feed';
import { InterlockCautions } from '../interlocks/interlock-cautions';
import { formatAzimuth, formatQuantity } from '../readout/format-quantity';
import { PathMap } from './path-map';
import { PreflightTable } from './preflight-table';
import { EMPTY_DRAFT, requestFromDraft, STEER_LABELS } from './steer-draft';
import { SteerStatus } from './steer-status';
import { mapPath, SteeringRequests } from './steering-requests';
import { SteeringWatch } from './steering-watch';

/** Where the form is: editing, checked (pre-flight shown), confirming, sending. */
type Stage = 'edit' | 'checking' | 'checked' | 'confirm' | 'sending';

/**
 * The Steer page: the target form (|B|, θ, φ, ramp time, reason), the pre-flight table, the
 * path on the orientation map with the present direction, a confirm step before anything is
 * sent, and abort/release of what steers now. Viewers see the state only.
 */
@Component({
  selector: 'tw-steer-page',
  imports: [InterlockCautions, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, PathMap, PreflightTable, ReactiveFormsModule, SteerStatus],
  providers: [SteeringWatch],
  templateUrl: './steer-page.html',
  styleUrl: './steer-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SteerPage {
  private readonly requests = inject(SteeringRequests);
  private readonly session = inject(Session);
  private readonly feed = inject(LiveFeed);
  protected readonly watch = inject(SteeringWatch);

  protected readonly mayCommand = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'operator');
  });
  protected readonly labels = STEER_LABELS;
  protected readonly form = new FormGroup({
    magnitudeG: new FormControl(EMPTY_DRAFT.magnitudeG, { nonNullable: true }),
    thetaDeg: new FormControl(EMPTY_DRAFT.thetaDeg, { nonNullable: true }),
    phiDeg: new FormControl(EMPTY_DRAFT.phiDeg, { nonNullable: true }),
    rampS: new FormControl(EMPTY_DRAFT.rampS, { nonNullable: true }),
    reason: new FormControl(EMPTY_DRAFT.reason, { nonNullable: true }),
  });
  /** The New target inputs by the request field each one sends. */
  private readonly targetControls = { ...this.form.controls, rampMs: this.form.controls.rampS };
  protected readonly stopReason = new FormControl('', { nonNullable: true });
  protected readonly fieldMessage = fieldMessage;
  protected readonly stage = signal<Stage>('edit');
  protected readonly result = signal<PreflightResult | null>(null);
  /** The request the shown pre-flight belongs to. */
  private readonly checkedRequest = signal<SteerTargetRequest | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);
  protected readonly now = signal(Date.now());

  protected readonly field = computed(() => this.feed.live()?.field ?? null);
  protected readonly status = this.watch.status;

  /** The path on the map: the checked plan while one is shown, else the ramp in force. */
  protected readonly path = computed(() => mapPath(this.result()?.path ?? this.status()?.path ?? []));
  protected readonly pathCaption = computed(() =>
    this.result() ? 'Planned path of the checked target' : this.status()?.mode === 'ramping' ? 'Path of the ramp in progress' : this.status()?.mode === 'holding' ? 'Path of the last ramp' : 'No path planned',
  );
  protected readonly failedCount = computed(() => this.result()?.checks.filter((c) => !c.ok).length ?? 0);
  protected readonly finalCurrents = computed(() => this.result()?.path.at(-1)?.currentsA ?? null);

  constructor() {
    const timer = setInterval(() => this.now.set(Date.now()), 500);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
    // A change makes the shown checks belong to another target.
    this.form.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => {
      if (this.stage() !== 'edit') this.stage.set('edit');
      this.result.set(null);
      this.problem.set(null);
    });
  }

  protected useMeasured(): void {
    const f = this.field();
    if (!f || f.thetaDeg === null || f.phiDeg === null) return;
    this.form.patchValue({ magnitudeG: f.magnitude.toFixed(2), thetaDeg: f.thetaDeg.toFixed(1), phiDeg: f.phiDeg.toFixed(1) });
  }

  protected async check(): Promise<void> {
    const parsed = requestFromDraft(this.form.getRawValue());
    if ('problems' in parsed) {
      this.problem.set(null);
      markFields(this.form.controls, parsed.problems);
      return;
    }
    this.problem.set(null);
    this.notice.set(null);
    this.stage.set('checking');
    try {
      this.result.set(await this.requests.preflight(parsed.request));
      this.checkedRequest.set(parsed.request);
      this.stage.set('checked');
    } catch (err) {
      this.problem.set(placeServerError(err, this.targetControls));
      this.stage.set('edit');
    }
  }

  protected askConfirm(): void {
    if (this.result()?.ok) this.stage.set('confirm');
  }

  protected back(): void {
    this.stage.set('checked');
  }

  protected async steer(): Promise<void> {
    const request = this.checkedRequest();
    if (!request) return;
    this.stage.set('sending');
    this.form.disable({ emitEvent: false });
    const outcome = await this.requests.steer(request).catch((err: unknown) => ({ kind: 'failed' as const, err }));
    // Enabled before a refusal is placed: enabling checks the inputs afresh, which would clear it.
    this.form.enable({ emitEvent: false });
    if (outcome.kind === 'failed') {
      this.problem.set(placeServerError(outcome.err, this.targetControls));
      this.stage.set('checked');
    } else if (outcome.kind === 'refused') {
      this.result.set(outcome.result);
      this.problem.set('The server’s pre-flight failed just now (the apparatus changed since the check): nothing was sent.');
      this.stage.set('checked');
    } else {
      this.notice.set(`Steering to |B| ${formatQuantity(request.magnitudeG, 'G', 2)}, θ ${formatQuantity(request.thetaDeg, '°', 1)}, φ ${formatAzimuth(request.phiDeg, 1)}: command recorded and sent.`);
      this.result.set(null);
      this.stage.set('edit');
      this.form.controls.reason.reset();
    }
    await this.watch.refresh();
  }

  protected async abort(): Promise<void> {
    await this.stopCommand((reason) => this.requests.abort(reason), 'Ramp aborted: the present field is held.');
  }

  protected async release(): Promise<void> {
    await this.stopCommand((reason) => this.requests.release(reason), 'Steering released: the controller goes back to its own program once it hears nothing more.');
  }

  private async stopCommand(send: (reason: string) => Promise<unknown>, done: string): Promise<void> {
    const reason = this.stopReason.value.trim();
    if (!reason) {
      markField(this.stopReason, 'Reason for abort or release must say why (it goes into the audit trail)');
      return;
    }
    try {
      await send(reason);
      this.notice.set(done);
      this.problem.set(null);
      this.stopReason.reset();
    } catch (err) {
      this.problem.set(placeServerError(err, { reason: this.stopReason }));
    }
    await this.watch.refresh();
  }

  protected readonly azimuth = formatAzimuth;

  protected q(v: number | null | undefined, unit: string, digits: number): string {
    return formatQuantity(v, unit, digits);
  }
}
