import { Link, useRouter } from 'expo-router';
import { useCallback, useState } from 'react';
import { Pressable, StyleSheet, Text, useWindowDimensions, View } from 'react-native';
import { DossierFilter } from '../../../components/dossier-filter';
import { LoadMore } from '../../../components/load-more';
import { StatusBadge, VerdictBadge } from '../../../components/status';
import { formatWhen } from '../../../shared/dates';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Message } from '../../../components/ui/message';
import { Screen } from '../../../components/ui/screen';
import { colors, fonts, space, type, WIDE_BREAKPOINT } from '../../../constants/theme';
import { formatQuantity } from '../../../shared/units';
import type { DossierListItem } from '../../../hooks/types';
import type { DossierListFilter } from '../../../shared/schema/lists';
import { useDossiers, useProducts } from '../../../hooks/use-dossiers';
import { useMe } from '../../../hooks/use-me';

const limitText = (d: DossierListItem) => `${formatQuantity(d.requirement.safeVoltage, 'V')} within ${formatQuantity(d.requirement.maxTime, 's')}`;

export default function DossiersScreen() {
  const me = useMe().data!;
  const router = useRouter();
  // Newest first, a page at a time; the server filters and orders, so the list is never sorted here.
  const [filter, setFilter] = useState<DossierListFilter>({});
  // The filter reports every settled change; an unchanged one keeps the same key (and the pages loaded).
  const onFilter = useCallback((next: DossierListFilter) => setFilter((f) => (JSON.stringify(f) === JSON.stringify(next) ? f : next)), []);
  const filtered = filter.q !== undefined || filter.productId !== undefined || filter.status !== undefined;
  const dossiers = useDossiers(filter);
  const products = useProducts().data ?? [];
  const list = dossiers.items;
  const wide = useWindowDimensions().width >= WIDE_BREAKPOINT;
  const canCreate = me.role === 'engineer' || me.role === 'admin';

  return (
    <Screen
      title="Dossiers"
      subtitle="One dossier per requirement to prove, with its revisions; newest first."
      testID="dossiers-screen"
      actions={canCreate ? <Button label="New dossier" testID="new-dossier" onPress={() => router.push('/dossiers/new')} /> : null}
    >
      {dossiers.error ? <Message tone="error" text={dossiers.error.message} /> : null}
      <DossierFilter products={products} withStatus={me.role !== 'viewer'} onChange={onFilter} />
      {dossiers.total === 0 ? (
        <Message
          testID="dossiers-none"
          text={filtered ? `No dossier matches${filter.q ? ` “${filter.q}”` : ''} with these filters.` : 'No dossiers yet.'}
        />
      ) : null}
      {list.length === 0 ? null : wide ? (
        <Card>
          <View style={[styles.tr, styles.th]}>
            <Text style={[styles.cell, styles.c3, styles.head]}>Dossier</Text>
            <Text style={[styles.cell, styles.c2, styles.head]}>Product</Text>
            <Text style={[styles.cell, styles.c2, styles.head]}>Limit</Text>
            <Text style={[styles.cell, styles.c1, styles.head]}>Latest</Text>
            <Text style={[styles.cell, styles.c2, styles.head]}>Status</Text>
            <Text style={[styles.cell, styles.c2, styles.head]}>Last change</Text>
          </View>
          {list.map((d) => (
            <Link key={d.id} href={`/dossiers/${d.id}`} asChild>
              <Pressable style={styles.tr} testID={`dossier-row-${d.id}`}>
                <Text style={[styles.cell, styles.c3, styles.title]}>{d.title}</Text>
                <Text style={[styles.cell, styles.c2]}>{d.product.name}</Text>
                <Text style={[styles.cell, styles.c2]}>{limitText(d)}</Text>
                <Text style={[styles.cell, styles.c1]}>{d.latest ? `rev ${d.latest.number}` : '—'}</Text>
                <View style={[styles.c2, styles.badges]}>
                  {d.latest ? <StatusBadge status={d.latest.status} /> : null}
                  {d.latest ? <VerdictBadge verdict={d.latest.verdict} /> : null}
                </View>
                <Text style={[styles.cell, styles.c2]}>{formatWhen(d.latest?.updatedAt ?? null)}</Text>
              </Pressable>
            </Link>
          ))}
        </Card>
      ) : (
        list.map((d) => (
          <Link key={d.id} href={`/dossiers/${d.id}`} asChild>
            <Pressable testID={`dossier-card-${d.id}`}>
              <Card title={d.title}>
                <Text style={type.small}>
                  {d.product.name} · {limitText(d)}
                </Text>
                {d.latest ? (
                  <View style={styles.badges}>
                    <Text style={type.small}>Revision {d.latest.number}</Text>
                    <StatusBadge status={d.latest.status} />
                    <VerdictBadge verdict={d.latest.verdict} />
                  </View>
                ) : null}
                <Text style={type.small}>Last change {formatWhen(d.latest?.updatedAt ?? null)}</Text>
              </Card>
            </Pressable>
          </Link>
        ))
      )}
      <LoadMore list={dossiers} testID="dossiers-more" />
    </Screen>
  );
}

const styles = StyleSheet.create({
  tr: { flexDirection: 'row', alignItems: 'center', paddingVertical: space.sm, borderTopWidth: 1, borderTopColor: colors.line, gap: space.sm },
  th: { borderTopWidth: 0 },
  head: { fontFamily: fonts.semibold, color: colors.inkMuted, fontSize: 12, textTransform: 'uppercase' },
  cell: { ...type.body, fontSize: 14 },
  title: { fontFamily: fonts.semibold },
  c1: { flex: 1 },
  c2: { flex: 2 },
  c3: { flex: 3 },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, alignItems: 'center' },
});
