import { Text } from 'react-native';
import { Card } from '../../components/ui/card';
import { Screen } from '../../components/ui/screen';
import { type } from '../../constants/theme';
import { useMe } from '../../hooks/use-me';

export default function OverviewScreen() {
  const me = useMe().data!;
  return (
    <Screen title="Overview" subtitle={`Signed in as ${me.name} (${me.role})`} testID="overview-screen" showCaution>
      <Card title="My drafts">
        <Text style={type.body}>No drafts yet.</Text>
      </Card>
    </Screen>
  );
}
