import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { beforeEach, describe, expect, it } from 'vitest';
import type { LivePrediction } from '../../../shared/live/live-state';
import { PredictionPanel } from './prediction-panel';

const STABLE: LivePrediction = {
  stable: true,
  reason: null,
  fermiSurfaceAspect: 1.0205,
  cloudAspect: 4.99,
  tofAspect: 1.0204,
  tofMajorAngleDeg: 90,
  collapseRatio: 0.07,
  epsDd: 0.146,
  profileId: 3,
  thetaDeg: 0,
  phiDeg: 0,
  computedAt: '2026-03-01T21:04:13.000Z',
  camera: {
    imaging: 'y',
    tofMs: 20,
    inSituUm: { major: 3.93, minor: 3.30, majorAngleDeg: 0 },
    momentumPerUm: { major: 22.5, minor: 22.05, majorAngleDeg: 90 },
    tofUm: { major: 270, minor: 264.6, majorAngleDeg: 90 },
  },
};

const COLLAPSED: LivePrediction = {
  ...STABLE,
  stable: false,
  reason: 'no stable state: the energy has no minimum for this direction',
  fermiSurfaceAspect: null,
  cloudAspect: null,
  tofAspect: null,
  tofMajorAngleDeg: null,
  collapseRatio: 1.12,
  camera: null,
};

describe('PredictionPanel', () => {
  let fixture: ComponentFixture<PredictionPanel>;
  let host: HTMLElement;

  beforeEach(async () => {
    fixture = TestBed.createComponent(PredictionPanel);
    host = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });

  async function show(prediction: LivePrediction | null, staleNote: string | null = null): Promise<void> {
    fixture.componentRef.setInput('prediction', prediction);
    fixture.componentRef.setInput('staleNote', staleNote);
    await fixture.whenStable();
  }

  /** Text with every run of white space (including no-break spaces) as one space. */
  const flat = (element: Element) => element.textContent!.replace(/\s+/g, ' ');
  const text = () => flat(host);

  it('is a region named Prediction', () => {
    expect(host.getAttribute('role')).toBe('region');
    expect(host.getAttribute('aria-label')).toBe('Prediction');
  });

  it('shows β, its deviation in percent, the TOF aspect and a stable statement', async () => {
    await show(STABLE);
    expect(text()).toContain('1.0205');
    expect(text()).toContain('β − 1 = +2.05 %');
    expect(text()).toContain('1.0204');
    expect(text()).toContain('major axis 90.0° from x towards z');
    expect(flat(host.querySelector('[role="status"]')!)).toContain('Stable: ε_dd is 7.0 % of the collapse threshold.');
  });

  it('draws in-situ, momentum and TOF ellipses with the camera axes and the exaggeration printed', async () => {
    await show(STABLE);
    expect(host.querySelectorAll('ellipse')).toHaveLength(3);
    expect(text()).toContain('u = x, v = z (imaging along y)');
    // The in-situ cloud (aspect 1.19, set by the trap) keeps its true shape; momentum and TOF are enlarged.
    const factors = [...host.querySelectorAll('text.factor')].map((t) => t.textContent!.trim());
    expect(factors).toEqual(['true shape', 'deformation ×10', 'deformation ×10']);
  });

  it('says a collapsed gas is collapsed, with its collapse ratio, and draws no geometry', async () => {
    await show(COLLAPSED);
    const status = host.querySelector('[role="status"]')!;
    expect(flat(status)).toContain('Collapsed: ε_dd is 112.0 % of the collapse threshold.');
    expect(status.querySelector('mat-icon')!.textContent).toBe('dangerous');
    expect(host.querySelector('tw-camera-sketch')).toBeNull();
    expect(host.querySelector('ellipse')).toBeNull();
    expect(text()).not.toContain('β − 1');
    expect(text()).toContain('1.120');
  });

  it('marks itself stale with the note while the data is not current', async () => {
    await show(STABLE, 'Stale since 21:04:13');
    expect(host.classList).toContain('stale');
    expect(text()).toContain('Stale since 21:04:13');
  });

  it('says why the prediction does not apply and greys it, instead of calling the gas stable', async () => {
    await show(STABLE);
    fixture.componentRef.setInput('status', {
      state: 'weak-field',
      fieldG: 0.12,
      minFieldG: 0.5,
      reason: '|B| = 0.12 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.',
    });
    await fixture.whenStable();
    const status = flat(host.querySelector('[role="status"]')!);
    expect(status).toContain('Does not apply now.');
    expect(status).toContain('too weak to orient the dipoles');
    expect(status).not.toContain('Stable');
    expect(host.classList).toContain('stale');
  });

  it('says there is no prediction yet instead of showing numbers', async () => {
    await show(null);
    expect(text()).toContain('No prediction yet');
    expect(host.querySelector('dl')).toBeNull();
  });
});
