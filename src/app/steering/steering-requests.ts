import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type {
  PlannedPoint, PreflightResult, RunRecord, SequenceRecord, SequenceStep, SteeringStatus, SteerTargetRequest,
} from '../../../shared/steering/steering-api';

/** The answer of a steer command or a run start: done, or refused by the pre-flight (422) with its checks. */
export type CommandOutcome<T> = { kind: 'done'; value: T } | { kind: 'refused'; result: PreflightResult };

/** Body of `POST /api/sequences/preview`. */
export interface SequencePreview extends PreflightResult {
  durationMs: number;
}

/**
 * Steering, sequence and run requests. Each rejects with the server's `HttpErrorResponse`
 * (shown with `errorText`), except a failed pre-flight (422), which resolves as `refused` with
 * the checks so the page can show them. The server checks roles again.
 */
@Injectable({ providedIn: 'root' })
export class SteeringRequests {
  private readonly http = inject(HttpClient);

  status(): Promise<SteeringStatus> {
    return firstValueFrom(this.http.get<SteeringStatus>('/api/steering'));
  }

  preflight(request: SteerTargetRequest): Promise<PreflightResult> {
    return firstValueFrom(this.http.post<PreflightResult>('/api/steering/preflight', request));
  }

  steer(request: SteerTargetRequest): Promise<CommandOutcome<PreflightResult>> {
    return refusable(this.http.post<PreflightResult>('/api/steering/target', request));
  }

  abort(reason: string): Promise<SteeringStatus> {
    return firstValueFrom(this.http.post<SteeringStatus>('/api/steering/abort', { reason }));
  }

  release(reason: string): Promise<SteeringStatus> {
    return firstValueFrom(this.http.post<SteeringStatus>('/api/steering/release', { reason }));
  }

  sequences(): Promise<SequenceRecord[]> {
    return firstValueFrom(this.http.get<{ sequences: SequenceRecord[] }>('/api/sequences')).then((b) => b.sequences);
  }

  saveSequence(name: string, steps: SequenceStep[], reason: string): Promise<{ id: number; version: number }> {
    return firstValueFrom(this.http.post<{ id: number; version: number }>('/api/sequences', { name, steps, reason }));
  }

  previewSequence(steps: SequenceStep[]): Promise<SequencePreview> {
    return firstValueFrom(this.http.post<SequencePreview>('/api/sequences/preview', { steps }));
  }

  run(sequenceId: number, reason: string): Promise<CommandOutcome<{ runId: number }>> {
    return refusable(this.http.post<{ runId: number }>(`/api/sequences/${sequenceId}/run`, { reason }));
  }

  runs(): Promise<RunRecord[]> {
    return firstValueFrom(this.http.get<{ runs: RunRecord[] }>('/api/runs')).then((b) => b.runs);
  }

  getRun(id: number): Promise<RunRecord> {
    return firstValueFrom(this.http.get<RunRecord>(`/api/runs/${id}`));
  }

  abortRun(id: number, reason: string): Promise<RunRecord> {
    return firstValueFrom(this.http.post<RunRecord>(`/api/runs/${id}/abort`, { reason }));
  }
}

async function refusable<T>(request: Parameters<typeof firstValueFrom<T>>[0]): Promise<CommandOutcome<T>> {
  try {
    return { kind: 'done', value: await firstValueFrom(request) };
  } catch (err) {
    if (err instanceof HttpErrorResponse && err.status === 422 && err.error && Array.isArray((err.error as PreflightResult).checks)) {
      return { kind: 'refused', result: err.error as PreflightResult };
    }
    throw err;
  }
}

/** Directions of planned points in the frame of the orientation map (the profile's trap frame). */
export function mapPath(points: readonly PlannedPoint[]): { thetaDeg: number; phiDeg: number }[] {
  return points.flatMap((p) => (p.mapThetaDeg !== null && p.mapPhiDeg !== null ? [{ thetaDeg: p.mapThetaDeg, phiDeg: p.mapPhiDeg }] : []));
}
