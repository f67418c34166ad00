import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../../shared/auth/roles';
import type { ShotRow } from '../../../shared/shots/shots-api';
import type { RunRecord } from '../../../shared/steering/steering-api';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { ShotsPage } from './shots-page';

const SHOTS: ShotRow[] = [0.5, 0.7].map((ratio, i) => ({
  id: `shot-20261130T22000${i}Z-r3-abcdef`, label: `θ = ${30 * i}°`, at: `2026-11-30T22:00:0${i}.000Z`, runId: 3,
  field: { magnitude: 8, thetaDeg: 30 * i, phiDeg: 0 },
  prediction: { fermiSurfaceAspect: 1.03, cloudAspect: 1.2, tofAspect: 1.02, tofMajorAngleDeg: 90, collapseRatio: 0.4 },
  measured: { tofAspect: 1 + 0.02 * ratio, tofAngleDeg: 89, sigma: 0.002 },
}));
const RUN: RunRecord = {
  id: 3, sequenceId: 1, sequenceName: 'Tilt scan', sequenceVersion: 1, state: 'done', startedAt: '2026-11-30T21:59:00Z', endedAt: '2026-11-30T22:01:00Z',
  step: 2, stepCount: 2, actor: 'operator@tiltwatch.example', reason: 'night scan', endReason: null, shots: SHOTS,
};

describe('ShotsPage', { timeout: 30_000 }, () => {
  let fixture: ComponentFixture<ShotsPage>;
  let http: HttpTestingController;
  let host: HTMLElement;

  afterEach(() => localStorage.clear());

  async function settle(): Promise<void> {
    for (let i = 0; i < 5; i++) {
      TestBed.tick();
      await new Promise((resolve) => setTimeout(resolve, 0));
    }
    await fixture.whenStable();
  }

  async function open(role: Role): Promise<void> {
    configureSignedIn(role);
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ShotsPage);
    host = fixture.nativeElement as HTMLElement;
    TestBed.tick();
    http.expectOne('/api/runs').flush({ runs: [RUN] });
    await settle();
    http.expectOne((r) => r.url === '/api/shots' && r.params.get('run') === '3').flush({ shots: SHOTS });
    await settle();
  }

  it('shows the newest run\'s shots, the mean ratio of deformations with its spread, read only for a viewer', async () => {
    await open('viewer');
    expect(host.querySelectorAll('tr[mat-row]').length).toBe(2);
    expect(host.querySelector('table[mat-table]')!.textContent).toContain('1.0140');
    expect(host.querySelector('table[mat-table]')!.textContent).toContain('± 0.0020');
    // Ratios 0.5 and 0.7: mean 0.60, sample standard deviation 0.14.
    expect(host.querySelector('.agreement .figure')!.textContent).toMatch(/0\.60\s*± 0\.14\s*× predicted/);
    expect(host.querySelector('.caveat')!.textContent).toContain('T = 0');
    expect(host.querySelectorAll('tw-shot-chart').length).toBe(2);
    expect(host.querySelector('tw-measurement-upload')).toBeNull();
  });

  it('offers an operator the upload', async () => {
    await open('operator');
    expect(host.querySelector('tw-measurement-upload')).not.toBeNull();
  });

  it('reads the runs and the shown run\'s shots again on Reload', async () => {
    await open('viewer');
    const measured = SHOTS.map((s, i) => (i === 0 ? s : { ...s, measured: null }));
    [...host.querySelectorAll('button')].find((b) => b.textContent!.includes('Reload'))!.click();
    await settle();
    http.expectOne('/api/runs').flush({ runs: [RUN] });
    await settle();
    http.expectOne((r) => r.url === '/api/shots' && r.params.get('run') === '3').flush({ shots: measured });
    await settle();
    expect(host.querySelector('.agreement .figure')!.textContent).toMatch(/0\.50\s*× predicted/);
  });

  it('opens a run older than the list by its number, and says beside the field when there is none', async () => {
    await open('viewer');
    const field = () => [...host.querySelectorAll('mat-form-field')].find((f) => f.textContent!.includes('Run number'))!;
    const input = field().querySelector('input')!;
    const submit = () => [...host.querySelectorAll('button')].find((b) => b.textContent!.includes('Open'))!.click();
    input.value = '999';
    input.dispatchEvent(new Event('input'));
    submit();
    await settle();
    http.expectOne('/api/runs/999').flush({ error: 'No run with id 999' }, { status: 404, statusText: 'Not Found' });
    await settle();
    fixture.detectChanges();
    expect(field().textContent).toContain('Run number: there is no run 999');

    const older: RunRecord = { ...RUN, id: 1, sequenceName: 'Old scan', shots: [] };
    input.value = '1';
    input.dispatchEvent(new Event('input'));
    submit();
    await settle();
    http.expectOne('/api/runs/1').flush(older);
    await settle();
    http.expectOne((r) => r.url === '/api/shots' && r.params.get('run') === '1').flush({ shots: [] });
    await settle();
    expect(host.querySelector('mat-select')!.textContent).toContain('Run 1 · Old scan');
  });
});
