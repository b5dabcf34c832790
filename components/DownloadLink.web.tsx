import { colors, MIN_TOUCH, radius, space, fonts } from '@/constants/theme';

/** On the web a file is a plain link with `download`: the browser saves it, sending the session cookie. */
export function DownloadLink({ href, label, testID }: { href: string; label: string; testID?: string }) {
  return (
    <a
      href={href}
      download
      data-testid={testID}
      style={{
        display: 'inline-flex',
        alignItems: 'center',
        minHeight: MIN_TOUCH,
        padding: `0 ${space.lg}px`,
        borderRadius: radius.md,
        border: `1px solid ${colors.primary}`,
        backgroundColor: colors.surface,
        color: colors.primary,
        fontFamily: fonts.semibold,
        fontSize: 16,
        textDecoration: 'none',
        boxSizing: 'border-box',
      }}
    >
      {label}
    </a>
  );
}
