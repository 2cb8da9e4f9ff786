/**
 * Checks across the fields of one part, made in the form before anything is sent; the services make
 * the same refusals (core/project/validate.ts), so the form never offers a save they would refuse:
 * VIH above VIL (a receiver reads low below VIL and high above VIH), the absolute maximum above the
 * absolute minimum, VOH above VOL (the driver swings between them), Tco min not above Tco max.
 */
import type { DriverModel, ReceiverModel } from '../../../core/project/model.js';

const volts = (v: number) => `${v < 0 ? '\u2212' : ''}${Math.abs(v)} V`;
const ps = (s: number) => `${Number((s / 1e-12).toPrecision(6))} ps`;

/**
 * Errors keyed like the form's (`receiver.vih`, `driver.voh`, ...). A pair is checked only when both
 * of its fields were read without error (`known` holds the errors already found).
 */
export function partCrossChecks(
  part: string,
  driver: DriverModel | null,
  receiver: ReceiverModel | null,
  known: Record<string, string> = {},
): Record<string, string> {
  const errors: Record<string, string> = {};
  const ok = (...keys: string[]) => keys.every((k) => known[k] === undefined);
  if (receiver) {
    if (ok('receiver.vil', 'receiver.vih') && !(receiver.vih > receiver.vil)) {
      errors['receiver.vih'] = `${part} receiver VIH (AC): ${volts(receiver.vih)} must be above VIL (${volts(receiver.vil)})`;
    }
    if (ok('receiver.vminAbs', 'receiver.vmaxAbs') && !(receiver.vmaxAbs > receiver.vminAbs)) {
      errors['receiver.vmaxAbs'] = `${part} receiver absolute maximum: ${volts(receiver.vmaxAbs)} must be above the absolute minimum (${volts(receiver.vminAbs)})`;
    }
  }
  if (driver) {
    if (ok('driver.vol', 'driver.voh') && !(driver.voh > driver.vol)) {
      errors['driver.voh'] = `${part} driver VOH: ${volts(driver.voh)} must be above VOL (${volts(driver.vol)})`;
    }
    if (ok('driver.tcoMin', 'driver.tcoMax') && driver.tcoMin > driver.tcoMax) {
      errors['driver.tcoMax'] = `${part} driver Tco max: ${ps(driver.tcoMax)} is below Tco min (${ps(driver.tcoMin)})`;
    }
  }
  return errors;
}
