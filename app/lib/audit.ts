// How the audit trail's actions read on the owner's page. Pure: the page's filter uses it.
import type { AuditAction } from "../../db/schema/audit";

export const AUDIT_LABEL: Record<AuditAction, string> = {
  "version.published": "Version published",
  "version.retired": "Version retired",
  "member.role-changed": "Role changed",
  "member.deactivated": "Person deactivated",
  "member.reactivated": "Person reactivated",
  "invitation.sent": "Invitation sent",
  "invitation.accepted": "Invitation accepted",
  "invitation.withdrawn": "Invitation withdrawn",
  "run.taken-over": "Run taken over",
  "report.sent": "Report e-mailed",
  "sign-in.succeeded": "Signed in",
  "sign-in.refused": "Sign-in refused",
  "password.reset-requested": "Password reset asked for",
  "password.reset": "Password reset",
  "password.changed": "Password changed",
  "sessions.ended": "Sessions ended",
};
