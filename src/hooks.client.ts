import { z } from 'zod';

// Zod probes for `new Function` to compile fast parsers; the Content-Security-Policy forbids
// eval, so the probe would only raise a violation report. Parse without it in the browser.
z.config({ jitless: true });
