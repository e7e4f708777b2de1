package dev.cairn.bench;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.cli.serve.Service;
import dev.cairn.cli.serve.ServiceSettings;
import java.time.Duration;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;

/**
 * 1,000 requests at once against {@code cairn serve} on loopback (bounded to 4 minutes): every one gets a
 * well-formed answer of 200, 202, 400 or 429, none is lost (every good spec ends with its result, every bad
 * one with its refusal), and the server's memory stays bounded (results kept up to --keep-count; heap after a
 * collection within a bound).
 */
class ServiceLoadTest {

    @Test
    void aThousandRequestsAtOnceAreEachAnsweredAndNoneIsLost() throws Exception {
        ServiceSettings settings = ServiceSettings.DEFAULT.toBuilder().port(0).running(2).queued(64).keepCount(200).build();
        try (Service service = Service.start(settings)) {
            double before = ServiceLoad.heapMegabytes();
            ServiceLoad.Report r = ServiceLoad.run(service.address(), 1_000, Duration.ofMinutes(4));
            assertEquals(List.of(), r.problems());
            assertTrue(Set.of(200, 202, 400, 429).containsAll(r.firstStatuses().keySet()), r.toString());
            assertEquals(900, r.fitted(), r.toString());
            assertEquals(100, r.refusedAsBad(), r.toString());
            assertTrue(r.firstStatuses().getOrDefault(429, 0) > 0, "the queue did fill: " + r);
            double after = ServiceLoad.heapMegabytes();
            // 200 kept results of a few kB each, the queue's specs, both ends' buffers of 1,000 connections still
            // open (client and server share this process), the threads' parser buffers: bounded, and well below
            // the 1 GB the launcher gives the service
            assertTrue(after - before < 250, String.format("heap grew from %.0f to %.0f MB", before, after));
            String health = java.net.http.HttpClient.newHttpClient().send(java.net.http.HttpRequest.newBuilder(
                    service.address().resolve("/v1/health")).build(), java.net.http.HttpResponse.BodyHandlers.ofString()).body();
            assertTrue(health.contains("\"kept\":200") || health.matches(".*\"kept\":1?[0-9]{1,2},.*"), health);
            System.out.println("ServiceLoadTest: " + r);
        }
    }
}
