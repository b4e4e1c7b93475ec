/** The sharing panel of a notebook (the editor's "Share" button links here). */
export const sharingHref = (notebookId: string) => `/notebooks/${notebookId}/sharing` as const;

/** The read-only page a share link opens. */
export const sharedLinkHref = (token: string) => `/shared/${token}` as const;
