import type { AreaDefinition } from '@shared/areas'

/** What the shell's bar and its narrow-screen menu are given. */
export interface ShellProps {
  /** @description areas the user may open, already filtered by role, in the order of its work */
  areas: readonly AreaDefinition[]
  /** @description the signed-in person's name */
  userName: string
  /** @description their role, as people read it */
  roleLabel: string
}
