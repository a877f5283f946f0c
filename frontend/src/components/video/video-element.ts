import { createReactPlayer } from 'react-player/ReactPlayer';
import HtmlPlayer from 'react-player/HtmlPlayer';

// react-player with its plain HTML5 <video> player only. Our media are MP4 files behind signed
// API links, so the streaming-service players (HLS, DASH, hosted video sites, about 2 MB of
// script) would never be used; leaving them out keeps them out of the build. Every source goes
// to the <video> player, whose ref is the HTMLVideoElement itself.
const html5 = { key: 'html', name: 'html', canPlay: () => true, canEnablePIP: () => true, player: HtmlPlayer };

export const VideoElement = createReactPlayer([html5], html5);
