export { addComment, listComments, type CommentThread, type CommentView } from './store';
export { COMMENT_MAX, cleanComment, commentProblem } from './rules';
