import "server-only";
import { getDb } from "@coldtrail/db";

/** The one database handle of this server process (survives hot reload; see @coldtrail/db). */
export const db = () => getDb();
