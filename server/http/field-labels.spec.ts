import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { fieldLabel, labelled, labelledInside, labelledMessage } from './field-labels.js';
import { reasonText, safeText } from './fields.js';
import { ROUTE_BODIES } from './route-bodies.js';
import { HttpError } from './http-error.js';
import { parseInput } from './validate.js';

const Edit = z.strictObject({
  summary: labelled(safeText({ max: 100, min: 0 }), 'Summary').optional(),
  openItems: labelled(z.array(z.object({ text: labelled(safeText({ max: 100 }), 'New open item') })), 'New open item').optional(),
  steps: labelledInside(z.unknown(), 'Steps', (path) => `Step ${Number(path[0]) + 1}${path[1] === 'thetaDeg' ? ', θ' : ''}`),
  reason: labelled(reasonText(), 'Reason for the reset').default('x'),
  key: z.string().optional(),
});

describe('fieldLabel', () => {
  it('finds the label under optional, default and pipe wrappers', () => {
    expect(fieldLabel(Edit, ['summary'])).toBe('Summary');
    expect(fieldLabel(Edit, ['reason'])).toBe('Reason for the reset');
  });

  it('counts list items from 1 after the list label, without repeating it', () => {
    expect(fieldLabel(Edit, ['openItems', 1, 'text'])).toBe('New open item 2');
  });

  it('asks a field checked by its own code for the labels of its inputs', () => {
    expect(fieldLabel(Edit, ['steps', 2, 'thetaDeg'])).toBe('Step 3, θ');
  });

  it('gives null for a field without a label', () => {
    expect(fieldLabel(Edit, ['key'])).toBeNull();
    expect(fieldLabel(Edit, ['nowhere'])).toBeNull();
  });
});

describe('labelledMessage', () => {
  it('puts the label before the message once, and leaves a whole-request message alone', () => {
    expect(labelledMessage('Reason', ['reason'], 'must not be empty')).toBe('Reason: must not be empty');
    expect(labelledMessage('|B|', ['magnitudeG'], '|B| must be at most 200 G')).toBe('|B| must be at most 200 G');
    expect(labelledMessage(null, [], 'send role, disabled or both')).toBe('send role, disabled or both');
  });
});

describe('parseInput', () => {
  const refusal = (value: unknown) => {
    try {
      parseInput(Edit, value, 'body');
    } catch (error) {
      return error as HttpError;
    }
    throw new Error('accepted');
  };

  it('names the field as the form labels it, never by its key, and sends its path for the form', () => {
    const error = refusal({ summary: 'a\u0000b', steps: [] });
    expect(error.status).toBe(400);
    expect(error.message).toBe('Summary: must not contain a NUL character');
    expect(error.message).not.toMatch(/summary|body/);
    expect(error.field).toBe('summary');
  });

  it('names a list item by its number', () => {
    const error = refusal({ openItems: [{ text: 'fine' }, { text: '  ' }], steps: [] });
    expect(error.message).toMatch(/^New open item 2: must not be empty/);
    expect(error.field).toBe('openItems.1.text');
  });
});

describe('the request schemas of the write routes', () => {
  /** Every key a schema's objects declare, as paths (lists entered at item 0). */
  function paths(schema: z.ZodType, prefix: PropertyKey[] = []): PropertyKey[][] {
    const def = schema.def as unknown as { type: string; innerType?: z.ZodType; in?: z.ZodType; shape?: Record<string, z.ZodType>; element?: z.ZodType };
    if (['optional', 'nullable', 'default', 'prefault', 'readonly'].includes(def.type) && def.innerType) return paths(def.innerType, prefix);
    if (def.type === 'pipe' && def.in) return paths(def.in, prefix);
    if (def.type === 'array' && def.element) return paths(def.element, [...prefix, 0]);
    if (def.type === 'object' && def.shape) return Object.entries(def.shape).flatMap(([key, child]) => [[...prefix, key], ...paths(child, [...prefix, key])]);
    return [];
  }

  it.each(Object.entries(ROUTE_BODIES))('%s labels every field it declares', (_route, schema) => {
    const unlabelled = paths(schema!).filter((path) => path.length > 0 && fieldLabel(schema!, path) === null);
    expect(unlabelled).toEqual([]);
  });

  it('labels the inputs of the bodies the routes check with their own code', () => {
    expect(fieldLabel(ROUTE_BODIES['alarm-limits.update']!, ['rationale', 'cause'])).toBe('Cause');
    expect(fieldLabel(ROUTE_BODIES['alarm-limits.update']!, ['reason'])).toBe('Reason for this change');
    expect(fieldLabel(ROUTE_BODIES['levels.update']!, ['levels', 'trips', 'currentHighA'])).toBe('Current trip level (A)');
    expect(fieldLabel(ROUTE_BODIES['profiles.save']!, ['profile', 'trapHz', 1])).toBe('Frequency along y');
    expect(fieldLabel(ROUTE_BODIES['sequences.save']!, ['steps', 0, 'phiDeg'])).toBe('φ of step 1');
    expect(fieldLabel(ROUTE_BODIES['logbook.write']!, ['text'])).toBe('Entry');
  });

  it('labels the Steer page’s target as its New target form does, and a step as the sequence editor does', () => {
    const target = ROUTE_BODIES['steering.target']!;
    expect(['magnitudeG', 'thetaDeg', 'phiDeg', 'rampMs', 'reason'].map((key) => fieldLabel(target, [key]))).toEqual([
      '|B|',
      'θ (from trap z)',
      'φ (from trap x to y)',
      'Ramp time',
      'Reason (goes into the audit trail)',
    ]);
    expect(fieldLabel(ROUTE_BODIES['steering.abort']!, ['reason'])).toBe('Reason for abort or release');
    expect(fieldLabel(ROUTE_BODIES['sequences.save']!, ['steps', 2, 'thetaDeg'])).toBe('θ of step 3');
    expect(() => parseInput(target, { magnitudeG: 9, thetaDeg: 200, phiDeg: 0, rampMs: 4_000_000, reason: 'x' }, 'body')).toThrow(
      'θ (from trap z) must be at most 180 °; Ramp time must be at most 3600 s',
    );
  });
});
