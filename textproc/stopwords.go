package textproc

import (
	"slices"
	"strings"
)

// englishStopWords is the English stop list.
//
// Source: the English stop list published with the Snowball project
// (snowballstem.org, algorithms/english/stop.txt), written here from memory,
// joined with the list that github.com/kljensen/snowball v0.10.0 uses in
// english.IsStopWord, which adds "will", "just", "don", "s", "t", "now" and
// "can". Contractions are kept with a plain apostrophe because the analyzer
// writes every apostrophe as U+0027 before the look-up. Checked since: the
// list is word for word the English list of Debian's
// liblingua-stopwords-perl 0.12-2 (see below) joined with kljensen's.
var englishStopWords = makeSet(`
i me my myself we our ours ourselves you your yours yourself yourselves
he him his himself she her hers herself it its itself they them their
theirs themselves what which who whom this that these those am is are was
were be been being have has had having do does did doing would should could
ought i'm you're he's she's it's we're they're i've you've we've they've
i'd you'd he'd she'd we'd they'd i'll you'll he'll she'll we'll they'll
isn't aren't wasn't weren't hasn't haven't hadn't doesn't don't didn't
won't wouldn't shan't shouldn't can't cannot couldn't mustn't let's that's
who's what's here's there's when's where's why's how's a an the and but if
or because as until while of at by for with about against between into
through during before after above below to from up down in out on off over
under again further then once here there when where why how all any both
each few more most other some such no nor not only own same so than too
very will just don s t now can
`)

func makeSet(words string) map[string]struct{} {
	set := make(map[string]struct{})
	for _, w := range strings.Fields(words) {
		set[w] = struct{}{}
	}
	return set
}

// IsEnglishStopWord reports whether the folded token w is on the English
// stop list.
func IsEnglishStopWord(w string) bool {
	_, ok := englishStopWords[w]
	return ok
}

// The stop lists of the other languages are the lists of the Snowball
// project as shipped in Debian's liblingua-stopwords-perl 0.12-2 (the Perl
// module Lingua::StopWords 0.12, whose documentation says its lists "were
// created as part of the Snowball project"). Each was copied, in the
// module's order, from the qw() list of _stopwords() in
// /usr/share/perl5/Lingua/StopWords/<CODE>.pm, by
//
//	perl -0ne 'print $1 if /_stopwords\s*\{\s*return\s+qw\((.*?)\);/s' FR.pm
//
// and wrapped; the Norwegian and Hungarian lists repeat a few words there,
// which makeSet merges. Where github.com/kljensen/snowball v0.10.0 has an
// IsStopWord of its own, the French, Swedish and Hungarian lists are the
// same word for word; TestStopListsAgainstKljensen names the differences
// of the others.

// frenchStopWords is the French stop list (Lingua::StopWords FR.pm, see
// above). The elided forms "c", "d", "j", "l", "m", "n", "s", "t", "qu"
// are on it.
var frenchStopWords = makeSet(`
au aux avec ce ces dans de des du elle en et eux il je la le leur lui
ma mais me même mes moi mon ne nos notre nous on ou par pas pour qu
que qui sa se ses son sur ta te tes toi ton tu un une vos votre vous c
d j l à m n s t y été étée étées étés étant étante étants
étantes suis es est sommes êtes sont serai seras sera serons serez
seront serais serait serions seriez seraient étais était étions
étiez étaient fus fut fûmes fûtes furent sois soit soyons soyez
soient fusse fusses fût fussions fussiez fussent ayant ayante ayantes
ayants eu eue eues eus ai as avons avez ont aurai auras aura aurons
aurez auront aurais aurait aurions auriez auraient avais avait avions
aviez avaient eut eûmes eûtes eurent aie aies ait ayons ayez aient
eusse eusses eût eussions eussiez eussent`)

// spanishStopWords is the Spanish stop list (Lingua::StopWords ES.pm, see
// above).
var spanishStopWords = makeSet(`
de la que el en y a los del se las por un para con no una su al lo como
más pero sus le ya o este sí porque esta entre cuando muy sin sobre
también me hasta hay donde quien desde todo nos durante todos uno les
ni contra otros ese eso ante ellos e esto mí antes algunos qué unos
yo otro otras otra él tanto esa estos mucho quienes nada muchos cual
poco ella estar estas algunas algo nosotros mi mis tú te ti tu tus
ellas nosotras vosotros vosotras os mío mía míos mías tuyo tuya
tuyos tuyas suyo suya suyos suyas nuestro nuestra nuestros nuestras
vuestro vuestra vuestros vuestras esos esas estoy estás está estamos
estáis están esté estés estemos estéis estén estaré estarás
estará estaremos estaréis estarán estaría estarías estaríamos
estaríais estarían estaba estabas estábamos estabais estaban estuve
estuviste estuvo estuvimos estuvisteis estuvieron estuviera estuvieras
estuviéramos estuvierais estuvieran estuviese estuvieses estuviésemos
estuvieseis estuviesen estando estado estada estados estadas estad he
has ha hemos habéis han haya hayas hayamos hayáis hayan habré
habrás habrá habremos habréis habrán habría habrías habríamos
habríais habrían había habías habíamos habíais habían hube
hubiste hubo hubimos hubisteis hubieron hubiera hubieras hubiéramos
hubierais hubieran hubiese hubieses hubiésemos hubieseis hubiesen
habiendo habido habida habidos habidas soy eres es somos sois son sea
seas seamos seáis sean seré serás será seremos seréis serán
sería serías seríamos seríais serían era eras éramos erais eran
fui fuiste fue fuimos fuisteis fueron fuera fueras fuéramos fuerais
fueran fuese fueses fuésemos fueseis fuesen siendo sido tengo tienes
tiene tenemos tenéis tienen tenga tengas tengamos tengáis tengan
tendré tendrás tendrá tendremos tendréis tendrán tendría
tendrías tendríamos tendríais tendrían tenía tenías teníamos
teníais tenían tuve tuviste tuvo tuvimos tuvisteis tuvieron tuviera
tuvieras tuviéramos tuvierais tuvieran tuviese tuvieses tuviésemos
tuvieseis tuviesen teniendo tenido tenida tenidos tenidas tened`)

// russianStopWords is the Russian stop list (Lingua::StopWords RU.pm, see
// above). It writes е for ё ("еще"); the analyzer maps ё to е first.
var russianStopWords = makeSet(`
и в во не что он на я с со как а то все
она так его но да ты к у же вы за бы по
только ее мне было вот от меня еще нет о
из ему теперь когда даже ну вдруг ли
если уже или ни быть был него до вас
нибудь опять уж вам сказал ведь там
потом себя ничего ей может они тут где
есть надо ней для мы тебя их чем была
сам чтоб без будто человек чего раз
тоже себе под жизнь будет ж тогда кто
этот говорил того потому этого какой
совсем ним здесь этом один почти мой
тем чтобы нее кажется сейчас были куда
зачем сказать всех никогда сегодня
можно при наконец два об другой хоть
после над больше тот через эти нас про
всего них какая много разве сказала
три эту моя впрочем хорошо свою этой
перед иногда лучше чуть том нельзя
такой им более всегда конечно всю
между`)

// swedishStopWords is the Swedish stop list (Lingua::StopWords SV.pm, see
// above).
var swedishStopWords = makeSet(`
och det att i en jag hon som han på den med var sig för så till är
men ett om hade de av icke mig du henne då sin nu har inte hans honom
skulle hennes där min man ej vid kunde något från ut när efter upp
vi dem vara vad över än dig kan sina här ha mot alla under någon
eller allt mycket sedan ju denna själv detta åt utan varit hur ingen
mitt ni bli blev oss din dessa några deras blir mina samma vilken er
sådan vår blivit dess inom mellan sådant varför varje vilka ditt
vem vilket sitta sådana vart dina vars vårt våra ert era vilkas`)

// norwegianStopWords is the Norwegian stop list (Lingua::StopWords NO.pm,
// see above). It holds Bokmål and Nynorsk forms ("ikke", "ikkje").
var norwegianStopWords = makeSet(`
og i jeg det at en et den til er som på de med han av ikke ikkje der
så var meg seg men ett har om vi min mitt ha hadde hun nå over da ved
fra du ut sin dem oss opp man kan hans hvor eller hva skal selv sjøl
her alle vil bli ble blei blitt kunne inn når være kom noen noe ville
dere som deres kun ja etter ned skulle denne for deg si sine sitt mot
å meget hvorfor dette disse uten hvordan ingen din ditt blir samme
hvilken hvilke sånn inni mellom vår hver hvem vors hvis både bare
enn fordi før mange også slik vært være båe begge siden dykk
dykkar dei deira deires deim di då eg ein eit eitt elles honom hjå ho
hoe henne hennar hennes hoss hossen ikkje ingi inkje korleis korso kva
kvar kvarhelst kven kvi kvifor me medan mi mine mykje no nokon noka
nokor noko nokre si sia sidan so somt somme um upp vere vore verte vort
varte vart`)

// hungarianStopWords is the Hungarian stop list (Lingua::StopWords HU.pm,
// see above). Kept as published, although it lacks "is" ("also", a very
// frequent word; the list has "ison") and has "ill." with its full stop,
// which no token can match.
var hungarianStopWords = makeSet(`
a ahogy ahol aki akik akkor alatt által általában amely amelyek
amelyekben amelyeket amelyet amelynek ami amit amolyan amíg amikor át
abban ahhoz annak arra arról az azok azon azt azzal azért aztán
azután azonban bár be belül benne cikk cikkek cikkeket csak de e
eddig egész egy egyes egyetlen egyéb egyik egyre ekkor el elég ellen
elő először előtt első én éppen ebben ehhez emilyen ennek erre
ez ezt ezek ezen ezzel ezért és fel felé hanem hiszen hogy hogyan
igen így illetve ill. ill ilyen ilyenkor ison ismét itt jó jól
jobban kell kellett keresztül keressünk ki kívül között közül
legalább lehet lehetett legyen lenne lenni lesz lett maga magát majd
majd már más másik meg még mellett mert mely melyek mi mit míg
miért milyen mikor minden mindent mindenki mindig mint mintha mivel
most nagy nagyobb nagyon ne néha nekem neki nem néhány nélkül
nincs olyan ott össze ő ők őket pedig persze rá s saját sem semmi
sok sokat sokkal számára szemben szerint szinte talán tehát teljes
tovább továbbá több úgy ugyanis új újabb újra után utána
utolsó vagy vagyis valaki valami valamint való vagyok van vannak volt
voltam voltak voltunk vissza vele viszont volna`)

// IsStopWord reports whether the folded token w is on the stop list of
// language l. The list of [Undetermined] is the union of all the lists; a
// Russian w is looked up with ё written as е.
func IsStopWord(l Language, w string) bool {
	i, ok := langIndex(l)
	if !ok {
		return false
	}
	if p := langTable[i].prep; p != nil {
		w = p(w)
	}
	_, ok = langTable[i].stop[w]
	return ok
}

// StopWords returns the stop list of language l, sorted; nil for an
// unknown language.
func StopWords(l Language) []string {
	i, ok := langIndex(l)
	if !ok {
		return nil
	}
	out := make([]string, 0, len(langTable[i].stop))
	for w := range langTable[i].stop {
		out = append(out, w)
	}
	slices.Sort(out)
	return out
}
