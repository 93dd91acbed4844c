/**
 * Thrown when the requested fire pit cannot be built as asked (a bowl no ring of these units can
 * reach, a cap too shallow to sit on the wall…). `path` names the input field to blame, dotted
 * like the request body ("cap.depthIn"), so a form can show the message beside that field.
 */
export class PlanGeometryError extends Error {
  readonly path: string;

  constructor(path: string, message: string) {
    super(message);
    this.name = "PlanGeometryError";
    this.path = path;
  }
}
