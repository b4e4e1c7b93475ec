import { useEffect, useRef, useState } from 'react';
import type { PresenterState } from '../../shared/notebook/sharing';

export interface PresenterFollow {
  /** Someone other than the caller who presents the notebook now. */
  presenter: PresenterState | null;
  following: boolean;
  follow: () => void;
  stopFollowing: () => void;
  /** Set when the followed presenter stopped, until the next follow. */
  endedName: string | null;
}

/**
 * Following another person's presentation: `moveTo` is called with the presenter's cell when following
 * starts and whenever it changes. Following ends when that person stops presenting (or someone else takes over).
 */
export function useFollowPresenter(presenter: PresenterState | null, myId: string | undefined, moveTo: (cellId: string) => void): PresenterFollow {
  const [followedId, setFollowedId] = useState<string | null>(null);
  const [endedName, setEndedName] = useState<string | null>(null);
  const lastFollowedName = useRef<string | null>(null);
  const move = useRef(moveTo);
  move.current = moveTo;

  const other = presenter && presenter.userId !== myId ? presenter : null;
  const following = followedId !== null && other?.userId === followedId;

  useEffect(() => {
    if (followedId === null || other?.userId === followedId) return;
    setFollowedId(null);
    setEndedName(lastFollowedName.current);
  }, [followedId, other?.userId]);

  useEffect(() => {
    if (following && other?.cellId) move.current(other.cellId);
  }, [following, other?.cellId]);

  return {
    presenter: other,
    following,
    endedName,
    follow: () => {
      if (!other) return;
      lastFollowedName.current = other.name;
      setEndedName(null);
      setFollowedId(other.userId);
    },
    stopFollowing: () => setFollowedId(null),
  };
}
