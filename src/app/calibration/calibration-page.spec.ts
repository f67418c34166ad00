import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';
import type { Role } from '../../../shared/auth/roles';
import type { CalibrationDetail, CalibrationRecord } from '../../../shared/field/calibration-record';
import { DEMO_CALIBRATION, DEMO_COVARIANCE } from '../../../shared/field/demo-calibration';
import { configureSignedIn } from '../auth/signed-in-test-bed';
import { CalibrationPage } from './calibration-page';

const DEMO: CalibrationRecord = {
  id: 1, version: 1, label: 'Lindqvist Hall demo calibration', ...DEMO_CALIBRATION, covariance: DEMO_COVARIANCE, state: 'approved', kind: 'demo',
  fit: null, sourceName: null, mhzPerGauss: null, createdBy: 'system', createdAt: '2026-02-01T09:00:00Z', approvedBy: 'system',
  approvedAt: '2026-02-01T09:00:00Z', approvalReason: 'first start: demo calibration', active: true,
};
const DRAFT: CalibrationDetail = {
  ...DEMO, id: 2, version: 2, label: '|B| fit of scan.csv', state: 'draft', kind: 'magnitude', active: false, approvedBy: null, approvedAt: null, approvalReason: null,
  sourceName: 'scan.csv', createdBy: 'lead@tiltwatch.example',
  fit: {
    kind: 'magnitude', points: 2, gaussPerAmp: DEMO_CALIBRATION.gaussPerAmp, offsetGauss: DEMO_CALIBRATION.offsetGauss,
    standardErrors: { gaussPerAmp: [[0.00023, 0.0002, 0.0002], [0.0002, 0.0002, 0.0002], [0.0002, 0.0002, 0.0002]], offsetGauss: [0.0011, 0.001, 0.001] },
    residualRmsGauss: 0.0027, maxResidualGauss: 0.0068, gauge: 'matched to the active calibration v1',
  },
  points: [
    { line: 2, currentA: [1, 2, 3], measuredGauss: 4.5, fittedGauss: 4.497, residualGauss: [0.003], outlier: false },
    { line: 3, currentA: [-2, 1, 0.5], measuredGauss: 2.6, fittedGauss: 2.615, residualGauss: [-0.015], outlier: true },
  ],
};

describe('CalibrationPage', { timeout: 30_000 }, () => {
  let fixture: ComponentFixture<CalibrationPage>;
  let http: HttpTestingController;
  let host: HTMLElement;

  afterEach(() => localStorage.clear());

  async function open(role: Role): Promise<void> {
    configureSignedIn(role);
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CalibrationPage);
    host = fixture.nativeElement as HTMLElement;
    TestBed.tick();
    http.expectOne('/api/calibrations').flush({ calibrations: [DEMO, DRAFT] });
    // The active version's report is asked for once the list is in.
    (await nextRequest('/api/calibrations/1')).flush({ ...DEMO, points: null });
    await fixture.whenStable();
  }

  /** Lets the resources react (a few ticks and microtasks) until the request to `url` is out. */
  async function nextRequest(url: string) {
    for (let i = 0; i < 20 && http.match(url).length === 0; i++) {
      TestBed.tick();
      await new Promise((resolve) => setTimeout(resolve, 0));
      const found = http.match(url);
      if (found.length > 0) return found[0];
    }
    return http.expectOne(url);
  }

  async function choose(version: string): Promise<void> {
    [...host.querySelectorAll('button.version')].find((b) => b.textContent!.includes(version))!.dispatchEvent(new Event('click'));
    (await nextRequest('/api/calibrations/2')).flush(DRAFT);
    await fixture.whenStable();
  }

  it('lists the versions with who fitted and approved them, read only for a viewer', async () => {
    await open('viewer');
    const list = host.querySelector('section.list')!.textContent!;
    expect(list).toContain('v2');
    expect(list).toContain('draft');
    expect(list).toContain('lead@tiltwatch.example');
    expect(list).toMatch(/approved .* system/);
    expect(host.querySelector('tw-calibration-upload')).toBeNull();
    expect(host.textContent).toContain('Read only');
    await choose('v2');
    expect(host.querySelector('form.approval')).toBeNull();
    // The report: K with its standard error, the residual RMS in mG, the outlier line.
    expect(host.querySelector('tw-fit-report')!.textContent).toContain('1.21000 ± 0.00023');
    expect(host.querySelector('tw-fit-report')!.textContent).toContain('2.70 mG');
    expect(host.querySelector('.outliers')!.textContent).toContain('line 3');
  });

  it('offers the lead the upload and, for a draft, approval that needs a reason', async () => {
    await open('lead');
    expect(host.querySelector('tw-calibration-upload')).not.toBeNull();
    await choose('v2');
    const form = host.querySelector('form.approval') as HTMLFormElement;
    form.dispatchEvent(new Event('submit'));
    await fixture.whenStable();
    expect(host.querySelector('form.approval [role="alert"]')!.textContent).toContain('say why');
    const input = form.querySelector('input[name="reason"]') as HTMLInputElement;
    input.value = 'viewport flange moved';
    input.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    form.dispatchEvent(new Event('submit'));
    const request = http.expectOne('/api/calibrations/2/approve');
    expect(request.request.body).toEqual({ reason: 'viewport flange moved' });
  });
});
