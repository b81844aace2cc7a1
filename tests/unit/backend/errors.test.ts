// Mapping thrown values to the wire: database outages become 503, body-parser refusals keep their
// meaning, and anything unknown becomes a 500 that reveals nothing.
import { describe, expect, it } from 'vitest';
import { AppError, errorBody, isDatabaseUnavailable, NotFoundError, toAppError } from '../../../backend/src/errors';

function withCode(code: string, message = 'x'): Error {
  return Object.assign(new Error(message), { code });
}

describe('isDatabaseUnavailable', () => {
  it.each([
    ['connection refused', withCode('ECONNREFUSED', 'connect ECONNREFUSED 127.0.0.1:54320')],
    ['server shutting down (57P01)', withCode('57P01', 'terminating connection due to administrator command')],
    ['database starting up (57P03)', withCode('57P03', 'the database system is starting up')],
    ['connection terminated', new Error('Connection terminated unexpectedly')],
    ['pool connect timeout', new Error('timeout exceeded when trying to connect')],
    ['wrapped by TypeORM', Object.assign(new Error('query failed'), { driverError: withCode('08006') })],
    ['as a cause', new Error('outer', { cause: withCode('ECONNRESET') })],
    ['inside an AggregateError', new AggregateError([withCode('ECONNREFUSED')], '')],
  ])('recognises %s', (_label, err) => {
    expect(isDatabaseUnavailable(err)).toBe(true);
  });

  it.each([
    ['a unique violation', withCode('23505', 'duplicate key value violates unique constraint')],
    ['a syntax error', withCode('42601', 'syntax error at or near "SELEC"')],
    ['a plain error', new Error('boom')],
    ['a string', 'ECONNREFUSED'],
    ['null', null],
  ])('does not take %s for an outage', (_label, err) => {
    expect(isDatabaseUnavailable(err)).toBe(false);
  });
});

describe('toAppError and errorBody', () => {
  it.each([
    [withCode('ECONNREFUSED'), 503, 'database_unavailable'],
    [Object.assign(new SyntaxError('Unexpected token'), { type: 'entity.parse.failed', status: 400 }), 400, 'malformed_json'],
    [Object.assign(new Error('too large'), { type: 'entity.too.large', status: 413 }), 413, 'payload_too_large'],
    [Object.assign(new Error('unsupported charset "X"'), { type: 'charset.unsupported', status: 415 }), 415, 'bad_request'],
    [new TypeError("Cannot read properties of undefined (reading 'x')"), 500, 'internal_error'],
  ])('maps %s to %i %s', (err, status, code) => {
    const e = toAppError(err);
    expect([e.status, e.code]).toEqual([status, code]);
  });

  it('keeps app errors and never puts a stack or internal message on the wire', () => {
    const nf = new NotFoundError('Club not found.');
    expect(toAppError(nf)).toBe(nf);
    expect(errorBody(toAppError(new Error('secret table name users_x')))).toEqual({
      error: { code: 'internal_error', message: 'Something went wrong on our side.' },
    });
    expect(errorBody(new AppError(409, 'conflict', 'Stale.', { currentRevision: 3 }))).toEqual({
      error: { code: 'conflict', message: 'Stale.', details: { currentRevision: 3 } },
    });
  });
});
