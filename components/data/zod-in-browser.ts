// zod compiles its object parsers with `new Function` when it may, and finds out whether it may by
// trying once. The app's Content-Security-Policy has no 'unsafe-eval', so that try is reported as a
// CSP violation even though zod catches the refusal. In the browser zod runs without compiled parsers:
// every client module that parses with zod imports this module first. zod's configuration is global,
// so the server (which renders these modules too, and may compile) is left as it is.
import { z } from 'zod';

if (typeof window !== 'undefined') z.config({ jitless: true });
