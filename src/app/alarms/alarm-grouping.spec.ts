import { describe, expect, it } from 'vitest';
import { groupByFirstOut } from './alarm-grouping';

describe('groupByFirstOut', () => {
  it('folds the alarms a root fault raised under that first-out alarm', () => {
    const groups = groupByFirstOut([
      { id: 'temperature.x.HH', firstOutOf: 'flow.x.L' },
      { id: 'flow.x.L' },
      { id: 'temperature.x.H', firstOutOf: 'flow.x.L' },
      { id: 'current.y.H' },
    ]);
    expect(groups.map((g) => [g.head.id, g.members.map((m) => m.id)])).toEqual([
      ['flow.x.L', ['temperature.x.HH', 'temperature.x.H']],
      ['current.y.H', []],
    ]);
  });

  it('lists an alarm on its own when its first-out alarm is no longer active', () => {
    const groups = groupByFirstOut([{ id: 'temperature.x.H', firstOutOf: 'flow.x.L' }]);
    expect(groups).toEqual([{ head: { id: 'temperature.x.H', firstOutOf: 'flow.x.L' }, members: [] }]);
  });

  it('orders the members of a group by the time their condition began, as the fault spread', () => {
    const groups = groupByFirstOut([
      { id: 'temperature.x.HH', firstOutOf: 'flow.x.L', conditionSince: '2026-03-02T22:14:20.000Z' },
      { id: 'flow.x.L', conditionSince: '2026-03-02T22:14:00.000Z' },
      { id: 'currentDeviation.x.H', firstOutOf: 'flow.x.L', conditionSince: '2026-03-02T22:14:01.000Z' },
      { id: 'temperature.x.H', firstOutOf: 'flow.x.L', conditionSince: '2026-03-02T22:14:09.000Z' },
    ]);
    expect(groups[0].members.map((m) => m.id)).toEqual(['currentDeviation.x.H', 'temperature.x.H', 'temperature.x.HH']);
  });
});
