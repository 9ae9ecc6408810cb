// Running the organisation: branches, people and access, invitations, password resets, inspector access, settings.
export { newLinkToken, hashLinkToken, linkState, type LinkState } from "./tokens";
export { listAdminBranches, getAdminBranch, createBranch, updateBranch, type AdminBranchRow, type AdminBranchPage } from "./branches";
export {
  personBranchRows,
  wherePersonInScope,
  listPeople,
  getPerson,
  updatePersonAccess,
  setPersonActive,
  listPersonCertifications,
  listRecordActivity,
  describeAccess,
  membershipsFor,
  personStatus,
  type PersonRow,
  type PersonDetail,
  type PersonBranch,
  type PersonMembership,
  type PeoplePage,
  type PendingInvitation,
  type PersonCertification,
  type ActivityRow,
  type ActivityPage,
} from "./people";
export {
  createInvitation,
  resendInvitation,
  withdrawInvitation,
  describeInvitation,
  acceptInvitation,
  LINK_REFUSALS,
  type IssuedInvitation,
  type InvitationView,
} from "./invitations";
export { requestPasswordReset, describePasswordReset, resetPassword, RESET_REQUESTS_PER_HOUR, type IssuedReset } from "./password-resets";
export {
  listInspectorGrants,
  createInspectorGrant,
  revokeInspectorGrant,
  getInspectorGrantRef,
  grantState,
  grantExpiry,
  type InspectorGrantRow,
  type InspectorGrantPage,
  type CreatedGrant,
  type GrantBranch,
} from "./inspector-grants";
export { getOrganisationSettings, updateOrganisationSettings, parseStoredSettings, type OrganisationSettings } from "./settings";
export { createOrganisationWithOwner, type NewOrganisation } from "./organisations";
