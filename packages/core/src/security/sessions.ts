import type { Role } from "../vocabulary";

/**
 * Idle timeout of a signed-in session, in minutes: after this long without a request made by the person
 * (background polling does not count) the session ends and they sign in again. Every session also ends
 * 12 hours after sign-in, however active.
 *
 * Owners and compliance officers: 30 minutes, fixed as the default. They read and change every branch's
 * records, people, access and settings, often from an office computer others walk past; 30 minutes of
 * inactivity and 12 hours in all are what OWASP ASVS 4.0.3 V3.3.2 sets for level 2.
 *
 * Branch managers, technicians and inspectors: also 30 minutes by default, for the same ASVS level-2
 * figure. Their reach is smaller (one branch, their own work, or a read-only time-limited window), so an
 * organisation whose technicians log work from a phone on a roof, where a job can take more than half an
 * hour between two entries, may lengthen it for them alone (up to 4 hours) without loosening the
 * officers' sessions; the settings screen says that this goes beyond the level-2 figure.
 */
export const SESSION_IDLE_DEFAULTS = { officers: 30, others: 30 } as const;
export const SESSION_IDLE_LIMITS = { min: 5, officersMax: 60, othersMax: 240 } as const;

/** Roles whose sessions follow the officers' idle timeout. */
export const OFFICER_ROLES: readonly Role[] = ["owner", "compliance_officer"];

export interface SessionIdleSettings {
  officers: number;
  others: number;
}

/** The idle timeout for a person with these roles: the officers' one when they hold an owner's or officer's role. */
export function idleMinutesFor(roles: readonly Role[], settings: SessionIdleSettings): number {
  return roles.some((r) => OFFICER_ROLES.includes(r)) ? settings.officers : settings.others;
}
