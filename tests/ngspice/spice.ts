/**
 * The ngspice deck builder and runner for the comparison tests. It lives in scripts/ngspice.ts so the
 * solver benchmark can use it without depending on tests/; this path stays for the tests that import it.
 */
export * from '../../scripts/ngspice.js';
