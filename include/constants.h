/* constants.h — the numeric constants the program uses, each written once.
 *
 * Exact by definition; every file that needs one includes this header
 * (the method cores, the unit table, the hydraulics, the calc language's
 * `pi` and `g`). */
#ifndef HEADROOM_CONSTANTS_H
#define HEADROOM_CONSTANTS_H

#define CONST_PI 3.14159265358979323846
/* m/s^2: standard acceleration of gravity g_n, 3rd CGPM (1901); NIST SP 811. */
#define CONST_STANDARD_GRAVITY 9.80665
/* Pa: the standard atmosphere, 1 atm (ISO 2533). */
#define CONST_STANDARD_ATMOSPHERE 101325.0

#endif
