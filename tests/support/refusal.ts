import { AppError } from '../../lib/errors/app-error';

type ErrorClass<E extends Error> = abstract new (...args: never[]) => E;

/** The error `promise` is refused with, an AppError unless `type` names another class; any other error is thrown on, and a success fails. */
export async function refusal(promise: Promise<unknown>): Promise<AppError>;
export async function refusal<E extends Error>(promise: Promise<unknown>, type: ErrorClass<E>): Promise<E>;
export async function refusal(promise: Promise<unknown>, type: ErrorClass<Error> = AppError): Promise<Error> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof type) return error;
    throw error;
  }
  throw new Error('not refused');
}
