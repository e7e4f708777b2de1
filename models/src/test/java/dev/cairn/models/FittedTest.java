package dev.cairn.models;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.cairn.models.result.PooledResult;
import dev.cairn.models.result.Result;
import dev.cairn.models.spec.Spec;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** The typed entry points give each kind of model its own result type, and refuse a spec of another kind. */
class FittedTest {
    @Test
    void eachKindGetsItsOwnResultType() {
        Spec revenue = Spec.builder("spend").summaryRow("A", 1000, 30, 60.5, 160.2)
                .summaryRow("B", 1000, 40, 82.0, 215.0).build();
        Fitted<Result> r = Fitted.revenue(revenue, Path.of("."), FitOptions.DEFAULT);
        assertEquals(2, r.result().arms().size());
        assertTrue(r.result().arms().get("B").payerRate().median() > 0.03);
        Spec pooled = Spec.builder("pooled-effects").estimate("north", 0.1, 0.05).estimate("south", 0.02, 0.06)
                .estimate("east", 0.15, 0.08).build();
        Fitted<PooledResult> p = Fitted.pooled(pooled, Path.of("."), FitOptions.DEFAULT);
        assertEquals(3, p.result().effects().size());
        InputException wrong = assertThrows(InputException.class, () -> Fitted.retention(revenue, Path.of("."),
                FitOptions.DEFAULT));
        assertEquals("/model: 'spend' is not fitted by Fitted.retention; use Fitted.revenue", wrong.getMessage());
    }
}
