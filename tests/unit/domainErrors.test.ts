/**
 * Domain errors (server/domainErrors.ts) and their one mapping to HTTP (http/app.ts onError):
 * invalid input is 400 naming every offending field (design.md §4), and the rest keep the statuses
 * the API has always answered (RFC 9110 §15.5: 403 Forbidden, 404 Not Found, 409 Conflict).
 */
import { describe, expect, it } from 'vitest';
import { Conflict, Invalid, NotFound, Refused } from '../../server/domainErrors.ts';
import { domainErrorResponse } from '../../server/http/app.ts';

describe('domain errors mapped to HTTP once', () => {
  it.each([
    [new Invalid([{ path: 'heightM', message: 'must be > 0 m' }, { path: 'key', message: 'is required (text)' }]), 400, { error: 'invalid input', issues: [{ path: 'heightM', message: 'must be > 0 m' }, { path: 'key', message: 'is required (text)' }] }],
    [new Refused('wrong setup code'), 403, { error: 'wrong setup code' }],
    [new NotFound('sensor "west-mast"'), 404, { error: 'sensor "west-mast" not found' }],
    [new Conflict('a sensor with key "west-mast" exists'), 409, { error: 'a sensor with key "west-mast" exists' }],
  ])('%s → %i', (err, status, body) => {
    expect(domainErrorResponse(err)).toEqual({ status, body });
  });

  it('names its class, for the log', () => {
    expect(new NotFound('site').name).toBe('NotFound');
    expect(String(new Conflict('setup is already done'))).toBe('Conflict: setup is already done');
  });
});
