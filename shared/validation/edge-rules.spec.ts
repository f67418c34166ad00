import { describe, expect, it } from 'vitest';
import { hostileValueProblem, MAX_EDGE_DEPTH, numberProblem, textProblem } from './edge-rules.js';

describe('edge rules', () => {
  it.each([
    ['plain text', 'Coil x replaced', null],
    ['tabs and line breaks', 'line one\n\tline two\r\n', null],
    ['a surrogate pair (emoji)', 'ok \u{1F9CA}', null],
    ['a NUL', 'a\u0000b', /NUL/],
    ['a bell', 'a\u0007b', /control characters/],
    ['DEL', 'a\u007Fb', /control characters/],
    ['a lone high surrogate', 'a\uD800b', /lone surrogate/],
    ['a lone high surrogate at the end', 'ab\uDBFF', /lone surrogate/],
    ['a lone low surrogate', '\uDC00ab', /lone surrogate/],
    ['two high surrogates then a low one', '\uD800\uD800\uDC00', /lone surrogate/],
  ])('text with %s', (_what, text, problem) => {
    const found = textProblem(text);
    if (problem === null) expect(found).toBeNull();
    else expect(found).toMatch(problem);
  });

  it.each([
    [0, null],
    [-273.15, null],
    [1.7e12, null], // an epoch time in ms
    [1e15, null],
    [1e300, /between/],
    [-1e308, /between/],
    [Infinity, /finite/],
    [Number.NaN, /finite/],
  ])('number %d', (n, problem) => {
    const found = numberProblem(n);
    if (problem === null) expect(found).toBeNull();
    else expect(found).toMatch(problem);
  });

  it('names the path of the first problem in a nested value, field names included', () => {
    expect(hostileValueProblem({ profile: { name: 'ok', trapHz: [1, 2, 1e300] } })).toEqual({ path: 'profile.trapHz.2', problem: expect.stringMatching(/between/) });
    expect(hostileValueProblem({ reason: 'fine', note: 'x\u0000' })).toEqual({ path: 'note', problem: expect.stringMatching(/NUL/) });
    expect(hostileValueProblem({ ['bad\uD800']: 1 })?.problem).toMatch(/field name.*lone surrogate/);
    expect(hostileValueProblem({ a: [true, null, { b: 'fine' }] })).toBeNull();
  });

  it('refuses nesting deeper than the limit without overflowing the stack', () => {
    let deep: unknown = 'leaf';
    for (let i = 0; i < 100_000; i++) deep = [deep];
    expect(hostileValueProblem(deep)?.problem).toMatch(new RegExp(`${MAX_EDGE_DEPTH} levels`));
  });
});
