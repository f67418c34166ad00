import { TestBed } from '@angular/core/testing';
import { describe, expect, it } from 'vitest';
import type { ConnectionReading } from '../feed/connection-state';
import { ConnectionIndicator } from './connection-indicator';

const LIVE: ConnectionReading = { state: 'live', reason: null, dataAgeMs: 120, newestDataAtMs: Date.now() };

describe('ConnectionIndicator', () => {
  async function shown(reading: ConnectionReading, replaying: boolean): Promise<string> {
    const fixture = TestBed.createComponent(ConnectionIndicator);
    fixture.componentRef.setInput('reading', reading);
    fixture.componentRef.setInput('now', Date.now());
    fixture.componentRef.setInput('replaying', replaying);
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    return ['mat-icon', '.label', '.detail'].map((part) => host.querySelector(part)!.textContent!.trim()).join(' ').trim();
  }

  it('says Live while the page shows live data', async () => {
    expect(await shown(LIVE, false)).toBe('sensors Live');
  });

  it('names only the link, not Live, while the page shows a replay', async () => {
    expect(await shown(LIVE, true)).toBe('link Link up the page shows a replay, not live data');
  });
});
