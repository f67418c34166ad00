import { describe, expect, it } from 'vitest';
import { readWindow, windowBefore } from './window-pick';

describe('window form', () => {
  it('offers the last ten minutes to the second and reads them back', () => {
    const now = new Date(2026, 11, 2, 9, 30, 15, 400).getTime();
    const form = windowBefore(now);
    expect(form.fromTime).toBe('09:20:15');
    expect(form.toTime).toBe('09:30:15');
    expect(readWindow(form)).toEqual({ fromMs: new Date(2026, 11, 2, 9, 20, 15).getTime(), toMs: new Date(2026, 11, 2, 9, 30, 15).getTime() });
  });

  it('crosses midnight', () => {
    const form = windowBefore(new Date(2026, 11, 2, 0, 5, 0).getTime());
    expect(form.fromDate?.getDate()).toBe(1);
    expect(form.fromTime).toBe('23:55:00');
  });

  it('names the field of a bad or reversed window', () => {
    const day = new Date(2026, 11, 2);
    expect(readWindow({ fromDate: null, fromTime: '09:00', toDate: day, toTime: '10:00' })).toEqual({ problem: 'From: choose a date.' });
    expect(readWindow({ fromDate: day, fromTime: '09:00', toDate: day, toTime: '25:00' })).toEqual({ problem: 'To: enter the time as hh:mm:ss.' });
    expect(readWindow({ fromDate: day, fromTime: '10:00', toDate: day, toTime: '09:00:00' })).toEqual({ problem: 'To must be later than From.' });
  });
});
