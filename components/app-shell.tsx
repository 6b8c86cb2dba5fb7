import { Link, usePathname } from 'expo-router';
import type { ReactNode } from 'react';
import { Pressable, StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { colors, fonts, space, type, WIDE_BREAKPOINT } from '../constants/theme';
import type { Me, Role } from '../hooks/use-me';

interface NavItem {
  href: string;
  label: string;
  short: string;
  glyph: string;
  roles?: Role[];
  /** Shown in the phone's bottom bar; the rest live on the Account screen there. */
  bottom: boolean;
  /** Only where the server runs its local mail server (not in production). */
  devOnly?: boolean;
}

const NAV: NavItem[] = [
  { href: '/', label: 'Overview', short: 'Overview', glyph: '⌂', bottom: true },
  { href: '/quick-check', label: 'Quick check', short: 'Check', glyph: '⚡', bottom: true },
  { href: '/dossiers', label: 'Dossiers', short: 'Dossiers', glyph: '▤', bottom: true },
  { href: '/reviews', label: 'Reviews', short: 'Reviews', glyph: '✓', roles: ['reviewer', 'admin'], bottom: true },
  { href: '/snubber', label: 'Snubber sizing', short: 'Snubber', glyph: '∿', bottom: false },
  { href: '/team', label: 'Team', short: 'Team', glyph: '☰', roles: ['admin'], bottom: false },
  { href: '/outbox', label: 'Outbox (dev)', short: 'Outbox', glyph: '✉', roles: ['admin'], bottom: false, devOnly: true },
  { href: '/account', label: 'Account', short: 'Account', glyph: '◉', bottom: true },
];

export function navFor(me: Pick<Me, 'role' | 'outbox'>): NavItem[] {
  return NAV.filter((item) => (!item.roles || item.roles.includes(me.role)) && (!item.devOnly || me.outbox));
}

function isActive(pathname: string, href: string): boolean {
  return href === '/' ? pathname === '/' : pathname === href || pathname.startsWith(`${href}/`);
}

export function AppShell({ me, children }: { me: Me; children: ReactNode }) {
  const { width } = useWindowDimensions();
  const pathname = usePathname();
  const wide = width >= WIDE_BREAKPOINT;
  const items = navFor(me);

  if (wide) {
    return (
      <View style={styles.wideRoot}>
        <View style={styles.rail} testID="side-rail" role="navigation">
          <Text style={styles.brand}>Voltfall</Text>
          {items.map((item) => (
            <Link key={item.href} href={item.href as never} asChild>
              <Pressable
                testID={`nav-${item.short.toLowerCase()}`}
                style={StyleSheet.flatten([styles.railItem, isActive(pathname, item.href) && styles.railItemActive])}
              >
                <Text style={[styles.railText, isActive(pathname, item.href) && styles.railTextActive]}>
                  {item.glyph} {item.label}
                </Text>
              </Pressable>
            </Link>
          ))}
          <View style={styles.railFooter}>
            <Text style={styles.railUser} numberOfLines={1}>
              {me.name}
            </Text>
            <Text style={styles.railRole}>{me.role}</Text>
          </View>
        </View>
        <View style={styles.main}>{children}</View>
      </View>
    );
  }

  return (
    <View style={styles.phoneRoot}>
      <View style={styles.main}>{children}</View>
      <View style={styles.bottomBar} testID="bottom-nav" role="navigation">
        {items
          .filter((i) => i.bottom)
          .map((item) => {
            const active = isActive(pathname, item.href);
            return (
              <Link key={item.href} href={item.href as never} asChild>
                <Pressable testID={`nav-${item.short.toLowerCase()}`} style={styles.bottomItem} accessibilityState={{ selected: active }}>
                  <Text style={[styles.bottomGlyph, active && styles.bottomActive]}>{item.glyph}</Text>
                  <Text style={[styles.bottomText, active && styles.bottomActive]}>{item.short}</Text>
                </Pressable>
              </Link>
            );
          })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wideRoot: { flex: 1, flexDirection: 'row', backgroundColor: colors.paper },
  phoneRoot: { flex: 1, backgroundColor: colors.paper },
  main: { flex: 1 },
  rail: { width: 220, backgroundColor: colors.brand, paddingVertical: space.lg, paddingHorizontal: space.sm, gap: space.xs },
  brand: { fontFamily: fonts.bold, fontSize: 20, color: colors.surface, paddingHorizontal: space.md, paddingBottom: space.lg },
  railItem: { paddingVertical: space.sm, paddingHorizontal: space.md, borderRadius: 6 },
  railItemActive: { backgroundColor: 'rgba(255,255,255,0.14)' },
  railText: { fontFamily: fonts.medium, fontSize: 15, color: colors.brandSoft },
  railTextActive: { color: colors.surface, fontFamily: fonts.semibold },
  railFooter: { marginTop: 'auto', paddingHorizontal: space.md, gap: 2 },
  railUser: { ...type.small, color: colors.surface },
  railRole: { ...type.small, color: colors.brandSoft, textTransform: 'capitalize' },
  bottomBar: {
    flexDirection: 'row',
    borderTopWidth: 1,
    borderTopColor: colors.line,
    backgroundColor: colors.surface,
    paddingBottom: space.xs,
  },
  bottomItem: { flex: 1, alignItems: 'center', paddingVertical: space.sm, gap: 2, minHeight: 52 },
  bottomGlyph: { fontSize: 18, color: colors.inkMuted },
  bottomText: { fontFamily: fonts.medium, fontSize: 11, color: colors.inkMuted },
  bottomActive: { color: colors.brand, fontFamily: fonts.bold },
});
