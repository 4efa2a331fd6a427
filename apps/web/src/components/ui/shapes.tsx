import { Box, type BoxProps } from '@chakra-ui/react';

/**
 * Shapes that say a state without colour: a ring for "not yet", a triangle for "due", an
 * octagon for "overdue / act now", a check for "saved", a clock for "waiting". Each is hidden
 * from screen readers; the word beside it carries the meaning.
 */
export type ShapeKind = 'ring' | 'triangle' | 'octagon' | 'check' | 'clock' | 'cross' | 'bolt';

export function Shape({
  kind,
  size = '1.2em',
  ...rest
}: { kind: ShapeKind; size?: string } & Omit<BoxProps, 'children'>) {
  return (
    <Box
      as="span"
      display="inline-flex"
      flexShrink={0}
      aria-hidden="true"
      w={size}
      h={size}
      {...rest}
    >
      <svg
        viewBox="0 0 24 24"
        width="100%"
        height="100%"
        fill="none"
        stroke="currentColor"
        strokeWidth="2.5"
        strokeLinejoin="round"
        strokeLinecap="round"
      >
        {kind === 'ring' ? <circle cx="12" cy="12" r="8.5" /> : null}
        {kind === 'triangle' ? (
          <>
            <path d="M12 3 L22 20 H2 Z" fill="currentColor" stroke="none" />
            <path d="M12 9 v5 M12 17 v0.5" stroke="black" strokeOpacity="0.85" />
          </>
        ) : null}
        {kind === 'octagon' ? (
          <>
            <path d="M8 2 H16 L22 8 V16 L16 22 H8 L2 16 V8 Z" fill="currentColor" stroke="none" />
            <path d="M12 7 v6 M12 16.5 v0.5" stroke="white" strokeWidth="3" />
          </>
        ) : null}
        {kind === 'check' ? (
          <>
            <circle cx="12" cy="12" r="10" fill="currentColor" stroke="none" />
            <path d="M7 12.5 l3.2 3.2 L17 9" stroke="white" strokeWidth="3" />
          </>
        ) : null}
        {kind === 'clock' ? (
          <>
            <circle cx="12" cy="12" r="9" />
            <path d="M12 7 v5.5 l3.5 2" />
          </>
        ) : null}
        {kind === 'cross' ? (
          <>
            <circle cx="12" cy="12" r="10" fill="currentColor" stroke="none" />
            <path d="M8 8 l8 8 M16 8 l-8 8" stroke="white" strokeWidth="3" />
          </>
        ) : null}
        {kind === 'bolt' ? (
          <path d="M13 2 L4 14 H11 L10 22 L20 9 H13 Z" fill="currentColor" stroke="none" />
        ) : null}
      </svg>
    </Box>
  );
}
