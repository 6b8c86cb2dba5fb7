import { MutationCache, QueryCache, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Slot } from 'expo-router';
import { useState } from 'react';
import { ActivityIndicator, View } from 'react-native';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { ApiError } from '../hooks/api';
import { keys } from '../hooks/query-keys';
import { colors } from '../constants/theme';

export default function RootLayout() {
  const [fontsLoaded] = useFonts({
    Inter_400Regular: require('../fonts/Inter_400Regular.ttf'),
    Inter_500Medium: require('../fonts/Inter_500Medium.ttf'),
    Inter_600SemiBold: require('../fonts/Inter_600SemiBold.ttf'),
    Inter_700Bold: require('../fonts/Inter_700Bold.ttf'),
    DejaVuSansMono: require('../fonts/DejaVuSansMono.ttf'),
  });
  const [client] = useState(() => {
    // A session that ended (idle or absolute timeout, sign-out elsewhere) sends the app back to sign-in.
    const onError = (err: Error) => {
      if (err instanceof ApiError && err.code === 'not_signed_in') queryClient.setQueryData(keys.me, null);
    };
    const queryClient: QueryClient = new QueryClient({
      queryCache: new QueryCache({ onError }),
      mutationCache: new MutationCache({ onError }),
      defaultOptions: {
        queries: {
          // Client errors (4xx) will not change by retrying.
          retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
          refetchOnWindowFocus: false,
        },
      },
    });
    return queryClient;
  });
  if (!fontsLoaded) {
    return (
      <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.paper }}>
        <ActivityIndicator color={colors.brand} />
      </View>
    );
  }
  return (
    <SafeAreaProvider>
      <QueryClientProvider client={client}>
        <Slot />
      </QueryClientProvider>
    </SafeAreaProvider>
  );
}
