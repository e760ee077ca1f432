import { DeadlockException } from '@mikro-orm/core';
import { NotFoundException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { AuthErrorCode, EvaluationErrorCode, SheetErrorCode, WorkflowCode } from '@ampwright/common';
import { AuthException, ErrorCode, EvaluationException, SheetException, WorkflowException } from '../errors/app-exception';
import { AllExceptionsFilter } from './all-exceptions.filter';

describe(AllExceptionsFilter.name, () => {
  const filter = new AllExceptionsFilter();

  it("keeps a feature exception's code, message and details", () => {
    const body = filter.toBody(new SheetException(SheetErrorCode.ReadOnly, 'The sheet is approved and read-only.', { details: [{ message: 'x' }] }));
    expect(body).toEqual({ statusCode: 409, code: 'SHEET_READ_ONLY', message: 'The sheet is approved and read-only.', details: [{ message: 'x' }] });
  });

  it('gives each code its one status, and a workflow refusal the status of its kind', () => {
    expect(filter.toBody(new EvaluationException(EvaluationErrorCode.Busy, 'busy')).statusCode).toBe(429);
    expect(filter.toBody(new EvaluationException(EvaluationErrorCode.Timeout, 'slow')).statusCode).toBe(422);
    expect(filter.toBody(new AuthException(AuthErrorCode.BadCredentials, 'no')).statusCode).toBe(401);
    const refusal = (kind: 'conflict' | 'forbidden' | 'invalid') => new WorkflowException({ code: WorkflowCode.NotIndependent, kind, message: 'm' });
    expect([refusal('conflict'), refusal('forbidden'), refusal('invalid')].map((e) => filter.toBody(e).statusCode)).toEqual([409, 403, 400]);
  });

  it('maps Nest HTTP exceptions to a code by status', () => {
    expect(filter.toBody(new NotFoundException('No such sheet.'))).toEqual({ statusCode: 404, code: ErrorCode.NotFound, message: 'No such sheet.' });
  });

  it('answers an oversized body with 413 and a sentence', () => {
    const body = filter.toBody(Object.assign(new Error('request entity too large'), { status: 413, type: 'entity.too.large' }));
    expect(body.statusCode).toBe(413);
    expect(body.code).toBe(ErrorCode.PayloadTooLarge);
  });

  it('answers a write the database aborted for a conflict (a deadlock; a Galera certification failure) with 409: nothing was stored', () => {
    const body = filter.toBody(new DeadlockException(new Error('Deadlock found when trying to get lock; try restarting transaction')));
    expect(body).toMatchObject({ statusCode: 409, code: ErrorCode.WriteConflict });
    expect(body.message).toMatch(/not stored/);
  });

  it("never shows an unknown error's text to the caller", () => {
    const body = filter.toBody(new TypeError('cannot read x of undefined'));
    expect(body.statusCode).toBe(500);
    expect(body.message).not.toMatch(/undefined/);
  });
});
