import { NotFoundException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { AppException, ErrorCode } from '../errors/app-exception';
import { AllExceptionsFilter } from './all-exceptions.filter';

describe(AllExceptionsFilter.name, () => {
  const filter = new AllExceptionsFilter();

  it("keeps a feature exception's code, message and details", () => {
    const body = filter.toBody(new AppException('SHEET_LOCKED', 'The sheet is approved and read-only.', 409, [{ message: 'x' }]));
    expect(body).toEqual({ statusCode: 409, code: 'SHEET_LOCKED', message: 'The sheet is approved and read-only.', details: [{ message: 'x' }] });
  });

  it('maps Nest HTTP exceptions to a code by status', () => {
    expect(filter.toBody(new NotFoundException('No such sheet.'))).toEqual({ statusCode: 404, code: ErrorCode.NotFound, message: 'No such sheet.' });
  });

  it('answers an oversized body with 413 and a sentence', () => {
    const body = filter.toBody(Object.assign(new Error('request entity too large'), { status: 413, type: 'entity.too.large' }));
    expect(body.statusCode).toBe(413);
    expect(body.code).toBe(ErrorCode.PayloadTooLarge);
  });

  it("never shows an unknown error's text to the caller", () => {
    const body = filter.toBody(new TypeError('cannot read x of undefined'));
    expect(body.statusCode).toBe(500);
    expect(body.message).not.toMatch(/undefined/);
  });
});
