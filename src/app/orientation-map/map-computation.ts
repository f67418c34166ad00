import { DestroyRef, Injectable, inject, signal } from '@angular/core';
import type { SampleParams } from '../../../shared/physics/sample';
import type { MapReply, MapRequest, MapSettings } from './map-protocol';

/** A finished map and what it was computed for. */
export interface ComputedMap {
  settings: MapSettings;
  /** Profile record id and a label such as "Lindqvist Hall 167Er, crossed trap · v3". */
  profileId: number;
  profileLabel: string;
  thetaDeg: number[];
  phiDeg: number[];
  /** Row-major [θ][φ]; NaN where the gas collapses. */
  values: Float64Array;
  epsDd: number;
  elapsedMs: number;
}

/** What the computation is doing. */
export type MapJobStatus =
  | { kind: 'idle' }
  | { kind: 'running'; fraction: number; settings: MapSettings }
  | { kind: 'done' }
  | { kind: 'cancelled' }
  | { kind: 'failed'; message: string };

/** Everything a computation needs besides the settings. */
export interface MapSample {
  profileId: number;
  profileLabel: string;
  params: SampleParams;
}

/**
 * Owns the orientation-map worker. One map at a time: starting another, cancelling, or leaving
 * the page terminates the running worker, because the solve inside it is synchronous and would
 * not see a cancel message until it had finished.
 */
@Injectable()
export class MapComputation {
  private worker: Worker | null = null;
  private jobId = 0;
  private job: { id: number; settings: MapSettings; sample: MapSample } | null = null;

  readonly status = signal<MapJobStatus>({ kind: 'idle' });
  /** The newest finished map; kept while a new one is computed. */
  readonly map = signal<ComputedMap | null>(null);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.stopWorker());
  }

  /** Starts computing a map, replacing any running computation. */
  start(settings: MapSettings, sample: MapSample): void {
    this.stopWorker();
    if (typeof Worker === 'undefined') {
      this.status.set({ kind: 'failed', message: 'This browser cannot run background computations (Web Workers), so the map cannot be computed.' });
      return;
    }
    const worker = new Worker(new URL('./orientation-map.worker', import.meta.url), { type: 'module' });
    const id = ++this.jobId;
    this.worker = worker;
    this.job = { id, settings, sample };
    worker.onmessage = (event: MessageEvent<MapReply>) => this.receive(event.data);
    worker.onerror = (event) => {
      event.preventDefault();
      this.fail(id, `The map computation stopped unexpectedly${event.message ? `: ${event.message}` : ''}. Try again.`);
    };
    this.status.set({ kind: 'running', fraction: 0, settings });
    const request: MapRequest = { type: 'compute', jobId: id, params: sample.params, ...settings };
    worker.postMessage(request);
  }

  /** Stops the running computation; the previous map stays on screen. */
  cancel(): void {
    if (this.status().kind !== 'running') return;
    this.stopWorker();
    this.status.set({ kind: 'cancelled' });
  }

  private receive(reply: MapReply): void {
    const job = this.job;
    if (!job || reply.jobId !== job.id) return;
    if (reply.type === 'progress') {
      this.status.set({ kind: 'running', fraction: reply.fraction, settings: job.settings });
    } else if (reply.type === 'error') {
      this.fail(job.id, reply.message);
    } else {
      this.map.set({
        settings: job.settings,
        profileId: job.sample.profileId,
        profileLabel: job.sample.profileLabel,
        thetaDeg: reply.thetaDeg,
        phiDeg: reply.phiDeg,
        values: reply.values,
        epsDd: reply.epsDd,
        elapsedMs: reply.elapsedMs,
      });
      this.status.set({ kind: 'done' });
      this.stopWorker();
    }
  }

  private fail(id: number, message: string): void {
    if (this.job?.id !== id) return;
    this.stopWorker();
    this.status.set({ kind: 'failed', message });
  }

  private stopWorker(): void {
    this.worker?.terminate();
    this.worker = null;
    this.job = null;
  }
}
