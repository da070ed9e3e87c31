// Failures to reach or open the database, worded for the person starting the app.
export type DatabaseFailure = "unreachable" | "locked" | "corrupted" | "migration";

export class DatabaseError extends Error {
  constructor(
    readonly failure: DatabaseFailure,
    message: string,
  ) {
    super(message);
    this.name = "DatabaseError";
  }
}
