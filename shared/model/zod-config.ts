import { z } from 'zod';

// No generated code: under the app's strict CSP zod's `new Function` probe would be reported as
// a violation (and refused), so schemas always run on zod's interpreter, in browser and server.
z.config({ jitless: true });
