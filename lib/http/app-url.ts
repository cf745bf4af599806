import { config } from '@/lib/config';

/** The app's public address, for links in e-mails (NEXTAUTH_URL, which `npm start` sets). */
export function appUrl(): string {
  return (config().NEXTAUTH_URL ?? 'http://127.0.0.1:3000').replace(/\/$/, '');
}
