export { CellComments, type CellCommentsProps } from './CellComments';
export { CommentThread, type CommentThreadProps } from './CommentThread';
export { NotebookComments, type NotebookCommentsProps } from './NotebookComments';
export { commentHtml, commentTextParts } from './commentMarkdown';
export { groupThreads, visibleCount, type CommentThreadData } from './threads';
