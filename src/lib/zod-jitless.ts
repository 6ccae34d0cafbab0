/**
 * Imported first by every zod schema module that client forms use. Zod 4 probes `new Function`
 * when it builds an object schema, to compile a fast parser; under our strict CSP (no
 * 'unsafe-eval') the browser reports that probe as a violation even though zod catches it.
 * `jitless` skips the probe and the compiled parser; form-sized inputs do not need it.
 */
import { z } from "zod";

z.config({ jitless: true });
