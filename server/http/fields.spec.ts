import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { boundedNumber, emailAddress, queryNumber, reasonText, safeText, secretText } from './fields.js';
import { HttpError } from './http-error.js';
import { parseInput } from './validate.js';

const problem = (schema: z.ZodType, value: unknown) => {
  try {
    parseInput(z.object({ field: schema }), { field: value }, 'body');
    return null;
  } catch (error) {
    expect(error).toBeInstanceOf(HttpError);
    return (error as HttpError).message;
  }
};

describe('request field building blocks', () => {
  it('safe text is trimmed, bounded and free of NUL, control characters and lone surrogates', () => {
    const schema = safeText({ max: 10 });
    expect(schema.parse('  ok  ')).toBe('ok');
    expect(schema.parse('two\nlines')).toBe('two\nlines');
    expect(problem(schema, '   ')).toMatch(/field: must not be empty/);
    expect(problem(schema, 'x'.repeat(11))).toMatch(/at most 10 characters/);
    expect(problem(schema, 'a\u0000')).toMatch(/field: must not contain a NUL character/);
    expect(problem(schema, '\uD83E')).toMatch(/lone surrogate/);
    expect(problem(schema, 42)).toMatch(/must be text/);
  });

  it('a reason says what it is for when missing', () => {
    expect(problem(reasonText(), '')).toMatch(/must not be empty: say why \(it goes into the audit trail\)/);
  });

  it('a secret is taken as typed, not trimmed', () => {
    expect(secretText({ min: 1, max: 20 }).parse(' pass phrase ')).toBe(' pass phrase ');
    expect(problem(secretText({ min: 12, max: 20 }), 'short')).toMatch(/at least 12 characters/);
    expect(problem(secretText({ min: 1, max: 20 }), 'a\u0000b')).toMatch(/NUL/);
  });

  it('an e-mail address is trimmed and lower-cased', () => {
    expect(emailAddress().parse(' Lead@Lindqvist-Hall.example ')).toBe('lead@lindqvist-hall.example');
    expect(problem(emailAddress(), 'lead')).toMatch(/must be an e-mail address/);
  });

  it('numbers are finite and within the field range', () => {
    const minutes = boundedNumber({ min: 1, max: 480, unit: 'min', integer: true });
    expect(minutes.parse(30)).toBe(30);
    expect(problem(minutes, 1e300)).toMatch(/must be a whole number from 1 to 480 min/);
    expect(problem(minutes, 2.5)).toMatch(/whole number/);
    expect(problem(minutes, '30')).toMatch(/must be a whole number/);
    const seconds = queryNumber({ min: 1, max: 3600 });
    expect(seconds.parse('60')).toBe(60);
    expect(problem(seconds, '1e999')).toMatch(/from 1 to 3600/);
    expect(problem(seconds, 'abc')).toMatch(/from 1 to 3600/);
  });
});
