'use client';
import { cloneElement, isValidElement } from 'react';
import { useParams } from 'next/navigation';

/** Passes the project id from the URL to the switcher so it shows where the user is. */
export function CurrentProject({ children }: { children: React.ReactNode }) {
  const params = useParams<{ projectId?: string }>();
  return isValidElement(children)
    ? cloneElement(children as React.ReactElement<{ current?: string }>, { current: params.projectId })
    : children;
}
