import { describe, expect, it } from 'vitest';
import { ChronomeshError, InvalidArgumentError } from '../src/index';

describe('typed errors', () => {
  it('carry code, field and expected range', () => {
    const e = new InvalidArgumentError('T must be > 0', { field: 'T', expected: '> 0', received: -1 });
    expect(e).toBeInstanceOf(ChronomeshError);
    expect(e.code).toBe('invalid-argument');
    expect(e.field).toBe('T');
    expect(e.name).toBe('InvalidArgumentError');
  });
});
