/** Constants of the atmosphere models, each with its source. */

import { SPEED_OF_LIGHT_MS } from '../gnss/index.js';
export { SPEED_OF_LIGHT_MS };
/** pi as fixed for the GPS user algorithms (IS-GPS-200, 20.3.3.4.3; check-values.md constants). */
export const GPS_PI = 3.1415926535898;
/** GPS L1 carrier (Hz), IS-GPS-200 3.3.1.1. */
export const FREQ_L1_HZ = 1_575.42e6;
/** BeiDou B1I carrier (Hz), BeiDou ICD B1I 4.2 (1561.098 MHz). */
export const FREQ_B1I_HZ = 1_561.098e6;
