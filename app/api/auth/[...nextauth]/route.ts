import NextAuth from 'next-auth';
import type { NextRequest } from 'next/server';
import { authOptions } from '@/lib/auth/auth-options';
import { AppError, errorResponse } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { isAcceptableCallbackUrl } from '@/lib/http/same-origin';

const nextAuth = NextAuth(authOptions);

// next-auth answers a callback URL it cannot parse (in the query or its cookie) with a 500 that
// blames the server's configuration: it is the request that is wrong, so it gets a 400.
async function handler(request: NextRequest, context: { params: Promise<{ nextauth: string[] }> }): Promise<Response> {
  const values = [
    ...request.nextUrl.searchParams.getAll('callbackUrl'),
    request.cookies.get(authOptions.cookies!.callbackUrl!.name)?.value,
  ].filter((v): v is string => v !== undefined && v !== '');
  if (values.some((v) => !isAcceptableCallbackUrl(v, appUrl()))) {
    return errorResponse(new AppError('bad_request', 'The callback URL is not a valid URL.'));
  }
  return nextAuth(request, context);
}

export { handler as GET, handler as POST };
